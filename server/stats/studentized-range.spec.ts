import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { tTwoSided } from './distributions.js';
import {
  gaussKronrod,
  integrate,
  studentizedRangeCdf,
  studentizedRangeQuantile,
  studentizedRangeUpperTail,
} from './studentized-range.js';

type Df = number | 'Inf';
interface CdfRow { q: number; nmeans: number; df: Df; scipyCdf: number; scipyUpperTail: number }
interface QRow { p: number; nmeans: number; df: Df; scipyQuantile: number }
// R 4.2.2 ptukey/qtukey grid with SciPy 1.17.1 studentized_range columns
// (shared/reference/r-datasets/studentized-range.json). The SciPy cdf matches mpmath to 2.2e-14.
const ref = JSON.parse(
  readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/studentized-range.json'), 'utf8'),
) as { cdf: CdfRow[]; quantiles: QRow[] };
const dfOf = (df: Df): number => (df === 'Inf' ? Infinity : df);
const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

describe('Gauss–Kronrod rule', () => {
  it('integrates x^n on [-1, 1] exactly up to degree 22 (K15) and its Gauss part up to 13 (G7)', () => {
    // exactness degrees 3n+1 = 22 (Kronrod, n = 7) and 2n-1 = 13 (Gauss) (Piessens et al. 1983,
    // QUADPACK); ∫_{-1}^{1} x^n dx = 2/(n+1) for even n, 0 for odd n
    for (let n = 0; n <= 22; n++) {
      const exact = n % 2 === 0 ? 2 / (n + 1) : 0;
      const { value, error } = gaussKronrod((x) => x ** n, -1, 1);
      expect(Math.abs(value - exact)).toBeLessThan(2e-15);
      // |K - G| is the Gauss error: zero (to rounding) while G7 is still exact
      if (n <= 13) expect(error).toBeLessThan(2e-15);
    }
    // degree 24 is beyond K15: the rule must show a visible error there, or the test above proves nothing
    expect(Math.abs(gaussKronrod((x) => x ** 24, -1, 1).value - 2 / 25)).toBeGreaterThan(1e-12);
  });

  it('adaptively integrates a peaked function to 1e-14', () => {
    // ∫_0^1 1/(1e-4 + x²) dx = 100 atan(100) (elementary)
    expect(rel(integrate((x) => 1 / (1e-4 + x * x), [0, 1], 1e-10), 100 * Math.atan(100))).toBeLessThan(1e-14);
  });
});

describe('studentized range distribution', () => {
  const rows = ref.cdf.filter((r) => [2, 3, 5, 10].includes(r.nmeans) && [5, 20, 'Inf'].includes(r.df));

  it('matches the SciPy cdf to 5e-14 absolute (SciPy is within 2.2e-14 of mpmath)', () => {
    let worst = 0;
    for (const r of rows) worst = Math.max(worst, Math.abs(studentizedRangeCdf(r.q, r.nmeans, dfOf(r.df)) - r.scipyCdf));
    expect(worst).toBeLessThan(5e-14);
  });

  it('matches the SciPy upper tail to 2e-13 absolute', () => {
    // SciPy's sf is 1 - cdf, so it is only good to its cdf accuracy in absolute terms; ours is
    // computed directly (see the exact k = 2 check below for the relative accuracy)
    let worst = 0;
    for (const r of rows) worst = Math.max(worst, Math.abs(studentizedRangeUpperTail(r.q, r.nmeans, dfOf(r.df)) - r.scipyUpperTail));
    expect(worst).toBeLessThan(2e-13);
  });

  it('reproduces the exact two-means identity P(Q > q) = 2 P(T_df > q/√2) to 1e-12 relative', () => {
    // identity in studentized-range.json twoMeansIdentity (range of 2 normals = √2 |Z|);
    // right side from distributions.ts tTwoSided (checked there against R pt)
    for (const df of [5, 20, 60]) {
      for (const q of [0.5, 2, 6, 12]) {
        expect(rel(studentizedRangeUpperTail(q, 2, df), tTwoSided(q / Math.SQRT2, df))).toBeLessThan(1e-12);
      }
    }
  });

  it('returns tiny upper tails with relative accuracy where 1 - cdf gives 0', () => {
    // k = 2, df = 54, q = 20: 2 P(T_54 > 20/√2) ≈ 1e-19, far below what 1 - cdf can show
    const exact = tTwoSided(20 / Math.SQRT2, 54);
    expect(exact).toBeLessThan(1e-18);
    expect(rel(studentizedRangeUpperTail(20, 2, 54), exact)).toBeLessThan(1e-10);
    // through the cdf the rounding error of 1 - cdf (~1e-16) swamps the value itself
    expect(Math.abs(1 - studentizedRangeCdf(20, 2, 54) - exact)).toBeGreaterThanOrEqual(0.99 * exact);
  });

  it('inverts to the SciPy quantiles (brentq, xtol 1e-15) to 1e-12 relative', () => {
    const qs = ref.quantiles.filter((r) => [2, 3, 10].includes(r.nmeans) && [5, 60, 'Inf'].includes(r.df));
    let worst = 0;
    for (const r of qs) worst = Math.max(worst, rel(studentizedRangeQuantile(r.p, r.nmeans, dfOf(r.df)), r.scipyQuantile));
    expect(worst).toBeLessThan(1e-12);
  });

  it('gives the tight 0.95 quantile for 3 means and 51 df used by the warpbreaks Tukey reference', () => {
    // R 4.2.2 uniroot(ptukey(q, 3, 51) - 0.95, tol 1e-13) = 3.41388256164126 (warpbreaks.json
    // tukeyTightQuantile.qCritTight); R's ptukey at df 51 is good to ~1e-12 (README), hence 1e-11
    expect(rel(studentizedRangeQuantile(0.95, 3, 51), 3.41388256164126)).toBeLessThan(1e-11);
  });

  it('rejects bad arguments, naming them', () => {
    expect(() => studentizedRangeCdf(1, 1, 10)).toThrow(/got 1/);
    expect(() => studentizedRangeCdf(1, 3, 0)).toThrow(/df must be > 0, got 0/);
    expect(() => studentizedRangeUpperTail(Number.NaN, 3, 10)).toThrow(/NaN/);
    expect(() => studentizedRangeQuantile(1, 3, 10)).toThrow(/got 1/);
  });
});
