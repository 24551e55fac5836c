import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { kruskalWallis } from './kruskal-wallis.js';

// R 4.2.2 kruskal.test on datasets::warpbreaks (shared/reference/r-datasets/warpbreaks.json)
interface ChiRef { statistic: number; df: number; p: number }
const wb = JSON.parse(readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/warpbreaks.json'), 'utf8')) as {
  data: { rows: [number, string, string][] }; kruskalTension: ChiRef; kruskalCells: ChiRef;
};
function groupBy(key: (r: [number, string, string]) => string): number[][] {
  const m = new Map<string, number[]>();
  for (const r of wb.data.rows) m.set(key(r), [...(m.get(key(r)) ?? []), r[0]]);
  return [...m.values()];
}
const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

describe('kruskalWallis', () => {
  it('matches R kruskal.test (with ties) over tension and over the cells', () => {
    // warpbreaks has many tied counts, so this exercises the tie correction; 1e-12 relative
    // (R's 15 digits; SciPy kruskal agrees to 5e-15, crosscheck-independent.json)
    for (const [groups, want] of [
      [groupBy((r) => r[2]), wb.kruskalTension],
      [groupBy((r) => `${r[1]}:${r[2]}`), wb.kruskalCells],
    ] as const) {
      const got = kruskalWallis(groups);
      expect(got.df).toBe(want.df);
      expect(rel(got.statistic, want.statistic)).toBeLessThan(1e-12);
      expect(rel(got.p, want.p)).toBeLessThan(1e-12);
    }
  });

  it('gives the untied closed form for two separated groups of three', () => {
    // ranks 1..3 vs 4..6: H = 12/(6*7) (6²/3 + 15²/3) - 21 = 27/7 (Kruskal & Wallis 1952 formula)
    expect(kruskalWallis([[1, 2, 3], [4, 5, 6]]).statistic).toBeCloseTo(27 / 7, 13);
  });

  it('does not depend on the order of values within groups', () => {
    const g = groupBy((r) => r[2]).map((x) => [...x].reverse());
    expect(rel(kruskalWallis(g).statistic, wb.kruskalTension.statistic)).toBeLessThan(1e-12);
  });

  it('rejects all-tied data and empty groups', () => {
    expect(() => kruskalWallis([[2, 2], [2, 2]])).toThrow(/all values are tied/);
    expect(() => kruskalWallis([[1, 2], []])).toThrow(/group #2 has 0/);
  });
});
