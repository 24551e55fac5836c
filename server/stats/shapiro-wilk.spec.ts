import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { normalUpperQuantile } from './distributions.js';
import { shapiroWilk } from './shapiro-wilk.js';

// R 4.2.2 datasets::warpbreaks, shapiro.test(residuals(aov(breaks ~ wool * tension)))
// (shared/reference/r-datasets/warpbreaks.json)
const wb = JSON.parse(readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/warpbreaks.json'), 'utf8')) as {
  data: { rows: [number, string, string][] }; shapiroResidualsTwoWay: { W: number; p: number };
};
const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

/** Residuals of the full two-way model = value minus its cell mean (the cell-means model). */
function twoWayResiduals(): number[] {
  const cells = new Map<string, number[]>();
  for (const [y, wool, tension] of wb.data.rows) cells.set(`${wool}:${tension}`, [...(cells.get(`${wool}:${tension}`) ?? []), y]);
  const means = new Map([...cells].map(([k, v]) => [k, v.reduce((a, b) => a + b, 0) / v.length]));
  return wb.data.rows.map(([y, wool, tension]) => y - (means.get(`${wool}:${tension}`) as number));
}

describe('shapiroWilk', () => {
  it('matches R shapiro.test on the warpbreaks two-way residuals (n = 54)', () => {
    // R implements the same AS R94 in double precision, so 1e-12 relative is expected (measured:
    // W 1.2e-15, p 4e-14)
    const got = shapiroWilk(twoWayResiduals());
    expect(rel(got.w, wb.shapiroResidualsTwoWay.W)).toBeLessThan(1e-12);
    expect(rel(got.p, wb.shapiroResidualsTwoWay.p)).toBeLessThan(1e-12);
  });

  it('agrees with SciPy shapiro to the precision SciPy\'s implementation has', () => {
    // SciPy 1.17.1 shapiro: W 0.9868607600465971, p 0.816192894057088 (crosscheck-independent.json);
    // the README puts the R-vs-SciPy difference at 6e-11 (W) and 3e-9 (p): SciPy's AS R94 port keeps
    // some single-precision constants, so 1e-10 / 1e-8 are the honest tolerances here.
    const got = shapiroWilk(twoWayResiduals());
    expect(rel(got.w, 0.9868607600465971)).toBeLessThan(1e-10);
    expect(rel(got.p, 0.816192894057088)).toBeLessThan(1e-8);
  });

  it.each([
    // SciPy 1.17.1 scipy.stats.shapiro(x), run by the author of this test (values not in shared/);
    // covers the n <= 11 branch of the p-value and both coefficient branches (n <= 5, n > 5).
    [[4.1, 2.2, 3.9, 7.5], 0.9136953754006096, 0.5021985442364343],
    [[4.1, 2.2, 3.9, 7.5, 5.0], 0.9533338473518629, 0.7609704997864801],
    [[4.1, 2.2, 3.9, 7.5, 5.0, 4.4], 0.9297711327837362, 0.5783355970980528],
    [[1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 100], 0.4413677944590686, 3.0179846120209067e-7],
  ])('matches SciPy for %j', (x, w, p) => {
    const got = shapiroWilk(x);
    expect(rel(got.w, w)).toBeLessThan(1e-8);
    expect(rel(got.p, p)).toBeLessThan(1e-7);
  });

  it('gives the exact n = 3 result of Shapiro & Wilk (1965)', () => {
    // n = 3: a = (-1/√2, 0, 1/√2), so W = (x3 - x1)²/(2 SS); p = (6/π)(asin √W - π/3) (Shapiro & Wilk 1965)
    const x = [1, 2, 4];
    const ss = [1, 2, 4].reduce((s, v) => s + (v - 7 / 3) ** 2, 0);
    const w = 9 / 2 / ss;
    const got = shapiroWilk(x);
    expect(got.w).toBeCloseTo(w, 14);
    expect(got.p).toBeCloseTo((6 / Math.PI) * (Math.asin(Math.sqrt(w)) - Math.PI / 3), 14);
  });

  it('is invariant to order, shift and scale', () => {
    // W is a correlation of order statistics: location/scale invariant (Shapiro & Wilk 1965)
    const r = twoWayResiduals();
    const t = [...r].reverse().map((v) => 250 + 3.5 * v);
    expect(rel(shapiroWilk(t).w, shapiroWilk(r).w)).toBeLessThan(1e-13);
  });

  it('handles n = 5000: exact normal scores pass, an exponential sample fails (SciPy values)', () => {
    // SciPy 1.17.1 shapiro(norm.ppf((i + 0.5)/5000)) W = 0.9999889253590275 (p 1.0) and
    // shapiro(-log(1 - (i + 0.5)/5000)) W = 0.8163606777377908 (p 5.484038301122946e-60), run by the author of this test
    // (not in shared/).
    const n = 5000;
    const scores = Array.from({ length: n }, (_, i) => -normalUpperQuantile((i + 0.5) / n));
    const skewed = Array.from({ length: n }, (_, i) => -Math.log(1 - (i + 0.5) / n));
    expect(rel(shapiroWilk(scores).w, 0.9999889253590275)).toBeLessThan(1e-8);
    expect(shapiroWilk(scores).p).toBeGreaterThan(0.99);
    expect(rel(shapiroWilk(skewed).w, 0.8163606777377908)).toBeLessThan(1e-8);
    // p = 5.484038301122946e-60 (SciPy): the upper normal tail is computed directly, not as 1 - cdf;
    // 1e-6 relative because SciPy's W differs from ours by 4e-10, amplified in a tail this far out
    expect(rel(shapiroWilk(skewed).p, 5.484038301122946e-60)).toBeLessThan(1e-6);
  });

  it('rejects n outside 3..5000, non-finite values and constant samples', () => {
    expect(() => shapiroWilk([1, 2])).toThrow(/got 2/);
    expect(() => shapiroWilk(new Array<number>(5001).fill(0).map((_, i) => i))).toThrow(/got 5001/);
    expect(() => shapiroWilk([1, 2, Number.NaN])).toThrow(/NaN/);
    expect(() => shapiroWilk([3, 3, 3, 3])).toThrow(/equal to 3/);
  });
});
