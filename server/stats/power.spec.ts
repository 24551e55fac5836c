import { readFileSync } from 'node:fs';
import path from 'node:path';
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
