import { readFileSync } from 'node:fs';
import path from 'node:path';
import jstatPkg from 'jstat';
import { describe, expect, it } from 'vitest';
import { StatsInputError } from './errors.js';
import { cohenFFromDifference, factorialPower, oneWayPower, replicatesForPower } from './power.js';

interface PowerRow {
  k: number; n: number; f: number; df1: number; df2: number; ncp: number;
  fCritHighPrecision: number; powerHighPrecision: number; power: number; powerAnovaTest: number;
}
// R 4.2.2 qf/pf/power.anova.test + mpmath 1.3.0 (shared/reference/r-datasets/power-oneway.json)
const ref = JSON.parse(
  readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/power-oneway.json'), 'utf8'),
) as { rows: PowerRow[] };

const { jStat } = jstatPkg;

const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

describe('oneWayPower', () => {
  it('reproduces the mpmath power of all 27 one-way plans to 1e-12 relative', () => {
    // mpmath powerHighPrecision (power-oneway.json); the critical F comes from distributions.ts's
    // fUpperQuantile, so this also checks the quantile (a 1e-15 error in fCrit moves power by less
    // than 1e-14). Measured worst: about 7e-15.
    let worst = 0;
    for (const r of ref.rows) worst = Math.max(worst, rel(oneWayPower(r.k, r.n, r.f), r.powerHighPrecision));
    expect(worst).toBeLessThan(1e-12);
  });

  it('agrees with R power.anova.test to R\'s pf error bound', () => {
    // R 4.2.2 power.anova.test(...)$power (power-oneway.json powerAnovaTest); R's pf is good to ~1e-9
    for (const r of ref.rows) expect(Math.abs(oneWayPower(r.k, r.n, r.f) - r.powerAnovaTest)).toBeLessThan(1e-9);
  });

  it('uses the critical F of the high-precision reference', () => {
    // mpmath fCritHighPrecision (power-oneway.json), to 1e-13 relative
    for (const r of ref.rows) {
      const [row] = factorialPower({ factors: [{ name: 'A', levels: r.k }], replicates: r.n }, { kind: 'cohenF', f: r.f });
      expect(rel(row.fCrit, r.fCritHighPrecision)).toBeLessThan(1e-13);
      expect(row.ncp).toBeCloseTo(r.ncp, 12);
      expect([row.df, row.dfError]).toEqual([r.df1, r.df2]);
    }
  });

  it('rejects plans without error df and bad arguments, naming the value', () => {
    expect(() => oneWayPower(1, 5, 0.25)).toThrow(/groups.*1/);
    expect(() => oneWayPower(3, 1, 0.25)).toThrow(/replicates.*1/);
    expect(() => oneWayPower(3, 5, -0.1)).toThrow(/-0.1/);
    expect(() => oneWayPower(3, 5, 0.25, 1.5)).toThrow(/alpha.*1.5/);
  });
});

describe('cohenFFromDifference', () => {
  it('is Δ/(σ√(2a)) and equals the f of the explicit two-levels-at-±Δ/2 configuration', () => {
    // derivation in power.ts (Cohen 1988 §8.2 minimum-variability pattern): the root mean square of
    // effects (+Δ/2, -Δ/2, 0, 0) over a = 4 levels, computed here from its definition
    const delta = 3;
    const sigma = 2;
    const effects = [delta / 2, -delta / 2, 0, 0];
    const sigmaM = Math.sqrt(effects.reduce((s, e) => s + e * e, 0) / effects.length);
    expect(cohenFFromDifference(delta, sigma, 4)).toBeCloseTo(sigmaM / sigma, 15);
    expect(() => cohenFFromDifference(0, 1, 3)).toThrow(/difference.*0/);
    expect(() => cohenFFromDifference(1, 0, 3)).toThrow(/sigma.*0/);
  });

  it('gives, for two levels, the power of the same one-way plan stated with Cohen\'s f', () => {
    // With a = 2 the two-level configuration is the only one: f = Δ/(2σ) (Cohen 1988, d = 2f)
    const viaDelta = factorialPower({ factors: [{ name: 'A', levels: 2 }], replicates: 10 }, { kind: 'difference', delta: 0.5, sigma: 1 });
    expect(viaDelta[0].power).toBe(oneWayPower(2, 10, 0.25));
    // power-oneway.json k = 2, n = 10, f = 0.25: mpmath 0.1850956562911662
    expect(rel(viaDelta[0].power as number, 0.18509565629116623)).toBeLessThan(1e-12);
  });
});

describe('factorialPower', () => {
  const plan = { factors: [{ name: 'A', levels: 2 }, { name: 'B', levels: 3 }], replicates: 4 };

  it('takes term and error df from the design, with blocks removing b - 1 df', () => {
    // df arithmetic of a 2 x 3 full factorial, 24 runs: A 1, B 2, A:B 2, error 24 - 6 = 18;
    // four complete blocks take 3 more (common practice, no source)
    const rows = factorialPower(plan, { kind: 'cohenF', f: 0.25 });
    expect(rows.map((r) => [r.term, r.df, r.dfError])).toEqual([['A', 1, 18], ['B', 2, 18], ['A:B', 2, 18]]);
    const blocked = factorialPower({ ...plan, blocks: 'perReplicate' }, { kind: 'cohenF', f: 0.25 });
    expect(blocked.every((r) => r.dfError === 15)).toBe(true);
    const twoBlocks = factorialPower({ ...plan, blocks: 2 }, { kind: 'cohenF', f: 0.25 });
    expect(twoBlocks.every((r) => r.dfError === 17)).toBe(true);
  });

  it('matches the one-way reference when a main effect has the same df and λ', () => {
    // A main-effects-only 3 x 2 plan with 10 replicates: B (3 levels) has df 2, error 60 - 1 - 3 = 56;
    // λ = N f² = 60 f². The k = 3, n = 20 one-way row has df 2 / 57 and λ = 60 f², so the powers differ
    // only through the error df; the 57-df power must exceed the 56-df one slightly (more error df).
    const rows = factorialPower({ factors: [{ name: 'A', levels: 2 }, { name: 'B', levels: 3 }], replicates: 10, terms: [['A'], ['B']] }, { kind: 'cohenF', f: 0.25 });
    const b = rows.find((r) => r.term === 'B');
    const oneWay = ref.rows.find((r) => r.k === 3 && r.n === 20 && r.f === 0.25) as PowerRow;
    expect(b?.ncp).toBeCloseTo(oneWay.ncp, 12);
    expect(b?.power as number).toBeLessThan(oneWay.powerHighPrecision);
    expect(b?.power as number).toBeGreaterThan(oneWay.powerHighPrecision - 0.005);
  });

  it('reports no power for interactions stated as a difference, with the reason', () => {
    const rows = factorialPower(plan, { kind: 'difference', delta: 1, sigma: 1 });
    const ab = rows.find((r) => r.term === 'A:B');
    expect(ab?.power).toBeNull();
    expect(ab?.note).toMatch(/Cohen's f/);
  });

  it('rejects unreplicated full models, unknown terms, repeated factors and uneven blocks', () => {
    expect(() => factorialPower({ ...plan, replicates: 1 }, { kind: 'cohenF', f: 0.5 })).toThrow(/0 error degrees of freedom/);
    expect(() => factorialPower({ ...plan, terms: [['C']] }, { kind: 'cohenF', f: 0.5 })).toThrow(/"C"/);
    expect(() => factorialPower({ ...plan, factors: [{ name: 'A', levels: 2 }, { name: 'A', levels: 3 }] }, { kind: 'cohenF', f: 0.5 })).toThrow(/"A" is named twice/);
    expect(() => factorialPower({ ...plan, blocks: 3 }, { kind: 'cohenF', f: 0.5 })).toThrow(StatsInputError);
  });
});

describe('replicatesForPower', () => {
  it('finds the smallest n per group reaching the target, consistent with the reference grid', () => {
    // power-oneway.json (mpmath): k = 4, f = 0.4: n = 10 gives 0.4989, n = 20 gives 0.8454, so the
    // smallest n for 0.8 lies in 11..20; the answer must reach 0.8 and its predecessor must not.
    const found = replicatesForPower({ factors: [{ name: 'A', levels: 4 }], replicates: 1 }, { kind: 'cohenF', f: 0.4 }, 0.8);
    expect(found.replicates).toBeGreaterThan(10);
    expect(found.replicates).toBeLessThanOrEqual(20);
    expect(found.powers[0].power as number).toBeGreaterThanOrEqual(0.8);
    expect(oneWayPower(4, found.replicates - 1, 0.4)).toBeLessThan(0.8);
  });

  it('skips replicate counts that leave no error df and honours block counts', () => {
    const found = replicatesForPower({ factors: [{ name: 'A', levels: 2 }, { name: 'B', levels: 2 }], replicates: 1, blocks: 2 }, { kind: 'cohenF', f: 0.6 }, 0.9, ['A']);
    expect(found.replicates % 2).toBe(0);
    expect(found.powers.find((p) => p.term === 'A')?.power as number).toBeGreaterThanOrEqual(0.9);
    expect(() => replicatesForPower({ factors: [{ name: 'A', levels: 2 }], replicates: 1 }, { kind: 'cohenF', f: 0.01 }, 0.99, undefined, 5)).toThrow(/5 replicates/);
    expect(() => replicatesForPower({ factors: [{ name: 'A', levels: 2 }], replicates: 1 }, { kind: 'cohenF', f: 0.5 }, 1)).toThrow(/target power.*1/);
  });
});

describe('factorialPower for two-level fractions 2^(k-p)', () => {
  const names = (k: number) => Array.from({ length: k }, (_, i) => ({ name: 'ABCDEFGHJKL'[i], levels: 2 }));
  // 2^(4-1), I = ABCD: main effects and AB = CD, AC = BD, AD = BC (Box, Hunter & Hunter 2005, ch. 6)
  const halfOf4 = [['A'], ['B'], ['C'], ['D'], ['A', 'B'], ['A', 'C'], ['A', 'D']];

  it('takes N = r 2^(k-p) and the error df left by the listed model, and matches the mpmath power for df 1/8, λ 1.6', () => {
    // 2 replicates of 8 runs = 16; error 16 - 1 - 7 = 8 (arithmetic). Δ = √0.4 σ: λ = N Δ²/(4σ²) = 1.6
    // (two-level effect, Montgomery ch. 6, from memory). power-oneway.json k = 2, n = 5, f = 0.4 has
    // df 1/8 and λ 1.6: mpmath powerHighPrecision.
    const rows = factorialPower({ factors: names(4), replicates: 2, fraction: 1, terms: halfOf4 }, { kind: 'difference', delta: Math.sqrt(0.4), sigma: 1 });
    const want = ref.rows.find((r) => r.k === 2 && r.n === 5 && r.f === 0.4) as PowerRow;
    expect(rows.map((r) => [r.term, r.df, r.dfError])).toEqual(halfOf4.map((t) => [t.join(':'), 1, 8]));
    for (const r of rows.slice(0, 4)) {
      expect(r.ncp).toBeCloseTo(1.6, 14);
      expect(rel(r.power as number, want.powerHighPrecision)).toBeLessThan(1e-12);
    }
    expect(rows[4].power).toBeNull();
  });

  it('a resolution III fraction with main effects only: 2^(3-1) x 3 replicates, df 1/8, λ 0.625', () => {
    // C = AB: every two-factor interaction is aliased with a main effect, so the model is A, B, C;
    // 12 runs, error 12 - 1 - 3 = 8; f² = 0.625/12 gives λ = N f² = 0.625 (power.ts);
    // power-oneway.json k = 2, n = 5, f = 0.25 has df 1/8, λ 0.625: mpmath powerHighPrecision
    const rows = factorialPower({ factors: names(3), replicates: 3, fraction: 1, terms: [['A'], ['B'], ['C']] }, { kind: 'cohenF', f: Math.sqrt(0.625 / 12) });
    const want = ref.rows.find((r) => r.k === 2 && r.n === 5 && r.f === 0.25) as PowerRow;
    expect(rows.every((r) => r.dfError === 8)).toBe(true);
    expect(rel(rows[0].power as number, want.powerHighPrecision)).toBeLessThan(1e-12);
  });

  it('equals the full 2^3 with the same 16 runs and 7 model df', () => {
    // 2 replicates of the 2^(4-1) against 2 replicates of the full 2^3 (all terms): both N = 16,
    // 7 one-df terms, 8 error df, so each term has the same λ and the same test (arithmetic)
    const effect = { kind: 'difference' as const, delta: 1.2, sigma: 1 };
    const half = factorialPower({ factors: names(4), replicates: 2, fraction: 1, terms: halfOf4 }, effect);
    const full = factorialPower({ factors: names(3), replicates: 2 }, effect);
    expect(full.every((r) => r.dfError === 8)).toBe(true);
    expect(half[0].power).toBe(full[0].power);
    const fHalf = factorialPower({ factors: names(4), replicates: 2, fraction: 1, terms: halfOf4 }, { kind: 'cohenF', f: 0.6 });
    const fFull = factorialPower({ factors: names(3), replicates: 2 }, { kind: 'cohenF', f: 0.6 });
    expect(fHalf.map((r) => r.power)).toEqual(fFull.map((r) => r.power));
  });

  it('agrees with a power computed without the noncentral F (jstat t and χ² integral) and with SciPy', () => {
    // 2^(5-1) (I = ABCDE, resolution V: 5 main effects + 10 clear interactions) x 2 replicates in
    // 2 blocks: 32 runs, error 32 - 1 - 1 - 15 = 15; Δ = σ: λ = 32/4 = 8.
    // A 1-df F test is a two-sided t test: power = E_V[Φ(δ - t_c√(V/ν)) + Φ(-δ - t_c√(V/ν))], V ~ χ²_ν,
    // δ = √λ — integrated here with jstat's central normal, χ² and t only (Simpson, 20 000 panels).
    const terms = [...names(5).map((f) => [f.name])];
    for (let i = 0; i < 5; i++) for (let j = i + 1; j < 5; j++) terms.push(['ABCDE'[i], 'ABCDE'[j]]);
    const [a] = factorialPower({ factors: names(5), replicates: 2, blocks: 'perReplicate', fraction: 1, terms }, { kind: 'difference', delta: 1, sigma: 1 });
    expect([a.dfError, a.ncp]).toEqual([15, 8]);
    const nu = 15;
    const delta = Math.sqrt(8);
    const tc = jStat.studentt.inv(0.975, nu);
    const g = (v: number) => jStat.chisquare.pdf(v, nu) * (jStat.normal.cdf(delta - tc * Math.sqrt(v / nu), 0, 1) + jStat.normal.cdf(-delta - tc * Math.sqrt(v / nu), 0, 1));
    const top = 150;
    const panels = 20_000;
    const h = top / panels;
    let s = g(0) + g(top);
    for (let i = 1; i < panels; i++) s += (i % 2 ? 4 : 2) * g(i * h);
    const integral = (s * h) / 3;
    // jstat's t quantile (its incomplete beta stops at ~3e-7 relative steps, distributions.ts) and the
    // quadrature bound the agreement; measured 3e-9, a wrong df or λ moves the power by > 1e-3
    expect(Math.abs((a.power as number) - integral)).toBeLessThan(1e-7);
    // SciPy 1.17.1: stats.ncf.sf(stats.f.isf(0.05, 1, 15), 1, 15, 8) = 0.7529812081431989
    expect(rel(a.power as number, 0.7529812081431989)).toBeLessThan(1e-12);
  });

  it('finds replicates for a target on a fraction and refuses fractions it cannot check', () => {
    // Δ = σ on the 2^(4-1): the answer reaches 0.8 and one replicate fewer does not
    const plan = { factors: names(4), replicates: 1, fraction: 1, terms: halfOf4 };
    const found = replicatesForPower(plan, { kind: 'difference', delta: 1, sigma: 1 }, 0.8);
    expect(found.powers[0].power as number).toBeGreaterThanOrEqual(0.8);
    const before = factorialPower({ ...plan, replicates: found.replicates - 1 }, { kind: 'difference', delta: 1, sigma: 1 });
    expect(before[0].power as number).toBeLessThan(0.8);
    expect(() => factorialPower({ ...plan }, { kind: 'cohenF', f: 0.5 })).toThrow(/0 error degrees of freedom.*drop model terms/);
    expect(() => factorialPower({ factors: names(4), replicates: 2, fraction: 1 }, { kind: 'cohenF', f: 0.5 })).toThrow(/model terms listed/);
    expect(() => factorialPower({ ...plan, factors: [...names(3), { name: 'D', levels: 3 }] }, { kind: 'cohenF', f: 0.5 })).toThrow(/"D" has 3 levels/);
    expect(() => factorialPower({ ...plan, fraction: 3 }, { kind: 'cohenF', f: 0.5 })).toThrow(/p from 0 to 2, got 3/);
  });
});
