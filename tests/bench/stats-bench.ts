/**
 * Statistics-engine benchmark: the two-way ANOVA time for 10^3..10^6 runs of a 4 x 4 design
 * (balanced: closed form; unbalanced: least squares on the cell summaries), and the NIST StRD LRE
 * table (correct significant digits of SS, MS and F against the certified values, from text input).
 *
 * Run: `npx tsx tests/bench/stats-bench.ts` or through `npm run bench`. Timings are printed, never
 * asserted (RULES.md: speed goes to benchmarks, not tests).
 */
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { analyse } from '../../server/stats/analyse.js';
import type { AnalysisRow } from '../../server/stats/analysis-input.js';
import { oneWayAnova } from '../../server/stats/anova-one-way.js';
import { twoWayAnova } from '../../server/stats/anova-two-way.js';
import type { CodedFactor } from '../../server/stats/cell-stats.js';

/** mulberry32: a small seeded PRNG so every run of the benchmark sees the same data. */
function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface Design {
  y: Float64Array;
  a: CodedFactor;
  b: CodedFactor;
}

/** n runs of a 4 x 4 design; unbalanced: cell (i, j) gets a share proportional to 1 + i + 2j. */
function makeDesign(n: number, balanced: boolean, seed: number): Design {
  const rand = prng(seed);
  const y = new Float64Array(n);
  const ca = new Int32Array(n);
  const cb = new Int32Array(n);
  const weights = Array.from({ length: 16 }, (_, c) => (balanced ? 1 : 1 + (c % 4) + 2 * Math.floor(c / 4)));
  const total = weights.reduce((s, w) => s + w, 0);
  let run = 0;
  weights.forEach((w, c) => {
    const count = c === 15 ? n - run : Math.floor((n * w) / total);
    for (let k = 0; k < count; k++, run++) {
      const i = c % 4;
      const j = Math.floor(c / 4);
      // Box-Muller normal noise around an additive-plus-interaction mean
      const z = Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
      ca[run] = i;
      cb[run] = j;
      y[run] = 50 + 2 * i - j + 0.5 * i * j + 3 * z;
    }
  });
  const levels = ['1', '2', '3', '4'];
  return { y, a: { name: 'A', levels, codes: ca }, b: { name: 'B', levels, codes: cb } };
}

function timeIt(fn: () => void, repeats: number): number {
  fn(); // warm-up (JIT)
  const times: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    fn();
    times.push(performance.now() - t0);
  }
  times.sort((x, y) => x - y);
  return times[Math.floor(times.length / 2)];
}

function speedTable(): void {
  console.log('Two-way ANOVA (4 x 4, with interaction), median engine time in ms');
  console.log('        n   balanced  unbalanced   analyse() from rows, balanced (all outputs)');
  for (const n of [1e3, 1e4, 1e5, 1e6]) {
    const bal = makeDesign(n, true, 1);
    const unb = makeDesign(n, false, 2);
    const tBal = timeIt(() => twoWayAnova({ y: bal.y, a: bal.a, b: bal.b }), 5);
    const tUnb = timeIt(() => twoWayAnova({ y: unb.y, a: unb.a, b: unb.b, ssType: 2 }), 5);
    const rows: AnalysisRow[] = Array.from(bal.y, (v, i) => ({ factors: { A: bal.a.levels[bal.a.codes[i]], B: bal.b.levels[bal.b.codes[i]] }, value: v }));
    const tRows = timeIt(() => analyse({ rows, response: 'y', factors: ['A', 'B'] }), 3);
    console.log(`${String(n).padStart(9)} ${tBal.toFixed(2).padStart(10)} ${tUnb.toFixed(2).padStart(11)} ${tRows.toFixed(1).padStart(12)}`);
  }
}

interface NistFile {
  difficulty: string;
  groups: number[][];
  groupsAsPrinted: string[][];
  certified: { between: { ss: number; ms: number; f: number }; within: { ss: number; ms: number } };
}

function lre(x: number, c: number): number {
  return x === c ? 15 : Math.min(15, -Math.log10(Math.abs(x - c) / Math.abs(c)));
}

function lreTable(): void {
  const names = ['SiRstv', 'SmLs01', 'SmLs02', 'SmLs03', 'SmLs04', 'SmLs05', 'SmLs06', 'SmLs07', 'SmLs08', 'SmLs09', 'AtmWtAg'];
  console.log('\nNIST StRD ANOVA: LRE (correct significant digits, capped at 15), input as printed decimals');
  console.log('set       difficulty  SS_between MS_between    F  SS_within MS_within  F(doubles)*');
  for (const name of names) {
    const file = path.resolve(process.cwd(), '../shared/reference/nist-strd-anova', `${name}.json`);
    const d = JSON.parse(fs.readFileSync(file, 'utf8')) as NistFile;
    const r = oneWayAnova(d.groupsAsPrinted);
    const c = d.certified;
    const cols = [lre(r.effect.ss, c.between.ss), lre(r.effect.ms, c.between.ms), lre(r.effect.f, c.between.f), lre(r.residual.ss, c.within.ss), lre(r.residual.ms, c.within.ms)];
    const fromDoubles = lre(oneWayAnova(d.groups).effect.f, c.between.f);
    console.log(`${name.padEnd(9)} ${d.difficulty.padEnd(10)} ${cols.map((v) => v.toFixed(1).padStart(10)).join('')} ${fromDoubles.toFixed(1).padStart(11)}`);
  }
  console.log('* from JSON doubles: values with >= 3 shared leading digits are re-read as their shortest decimal (decimal-input.ts)');
}

export async function runStatsBench(): Promise<void> {
  speedTable();
  lreTable();
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  await runStatsBench();
}
