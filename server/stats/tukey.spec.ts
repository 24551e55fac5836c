import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { StatsInputError } from './errors.js';
import { tukeyHsd, type TukeyGroup } from './tukey.js';

interface RRow { comparison: string; diff: number; lwr: number; upr: number; pAdj: number }
const load = <T>(name: string): T =>
  JSON.parse(readFileSync(path.resolve(process.cwd(), `../shared/reference/r-datasets/${name}`), 'utf8')) as T;
// R 4.2.2 TukeyHSD on datasets::warpbreaks / ToothGrowth (shared/reference/r-datasets/*.json)
const wb = load<{
  data: { rows: [number, string, string][] };
  tukeyHSDTension: { tukeyTightQuantile: { rows: RRow[] } };
  tukeyHSDTwoWay: { terms: { tension: RRow[]; 'wool:tension': RRow[] } };
}>('warpbreaks.json');
const tg = load<{ data: { rows: [number, string, number][] }; tukeyHSDDoseFromTwoWay: { comparisons: RRow[] } }>('ToothGrowth.json');
const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

function groups<R extends unknown[]>(rows: R[], key: (r: R) => string, value: (r: R) => number, order: string[]): TukeyGroup[] {
  return order.map((label) => ({ label, values: rows.filter((r) => key(r) === label).map(value) }));
}
/** Residual mean square of the full two-way (cell means) model and its df. */
function cellModelError<R extends unknown[]>(rows: R[], cell: (r: R) => string, value: (r: R) => number): { mse: number; dfError: number } {
  const cells = new Map<string, number[]>();
  for (const r of rows) cells.set(cell(r), [...(cells.get(cell(r)) ?? []), value(r)]);
  let ss = 0;
  for (const v of cells.values()) {
    const m = v.reduce((a, b) => a + b, 0) / v.length;
    ss += v.reduce((a, b) => a + (b - m) ** 2, 0);
  }
  const dfError = rows.length - cells.size;
  return { mse: ss / dfError, dfError };
}
const byLabel = (rows: ReturnType<typeof tukeyHsd>, comparison: string) => rows.find((r) => `${r.b}-${r.a}` === comparison);

describe('tukeyHsd, one-way warpbreaks tension (df 51)', () => {
  const rows = tukeyHsd(groups(wb.data.rows, (r) => r[2], (r) => r[0], ['L', 'M', 'H']));

  it('orders comparisons as R ("M-L", "H-L", "H-M") with diff = mean(b) - mean(a)', () => {
    expect(rows.map((r) => `${r.b}-${r.a}`)).toEqual(['M-L', 'H-L', 'H-M']);
  });

  it('matches R\'s tight-quantile interval half-widths to 1e-10 relative', () => {
    // warpbreaks.json tukeyTightQuantile: R with the 0.95 quantile solved by uniroot (tol 1e-13);
    // SciPy tukey_hsd agrees with these to 5e-12 (crosscheck-independent.json). Compared as
    // half-widths (upr - diff), the part that depends on the quantile: a bound near 0 such as
    // M-L's upr = -0.44 would turn R's ~1e-10 absolute error into a large relative one.
    for (const want of wb.tukeyHSDTension.tukeyTightQuantile.rows) {
      const got = byLabel(rows, want.comparison);
      expect(rel(got?.diff as number, want.diff)).toBeLessThan(1e-13);
      expect(rel((got?.upper as number) - (got?.diff as number), want.upr - want.diff)).toBeLessThan(1e-10);
      expect(rel((got?.diff as number) - (got?.lower as number), want.diff - want.lwr)).toBeLessThan(1e-10);
    }
  });

  it('matches SciPy\'s intervals and adjusted p-values', () => {
    // SciPy 1.17.1 tukey_hsd (crosscheck-independent.json): its p = 1 - cdf with cdf good to 2e-14,
    // so 1e-11 relative for p >= 0.001; R's ptukey differs from these by up to 4e-9 (README)
    const scipy: Record<string, { lwr: number; p: number }> = {
      'M-L': { lwr: -19.559824443331905, p: 0.038459768068195954 },
      'H-L': { lwr: -24.282046665554127, p: 0.0014315033136218513 },
      'H-M': { lwr: -14.28204666555413, p: 0.46308309708596584 },
    };
    for (const [comparison, want] of Object.entries(scipy)) {
      const got = byLabel(rows, comparison);
      expect(rel(got?.lower as number, want.lwr)).toBeLessThan(1e-12);
      expect(rel(got?.p as number, want.p)).toBeLessThan(1e-10);
    }
  });
});

describe('tukeyHsd with the two-way model\'s error term (R TukeyHSD on aov(breaks ~ wool * tension))', () => {
  const error = cellModelError(wb.data.rows, (r) => `${r[1]}:${r[2]}`, (r) => r[0]);
  // R's qtukey/ptukey: at df 48 they agree with SciPy to ~4e-9 relative / 1.3e-9 absolute (README),
  // so the tolerances here are set by R's own accuracy, not ours.
  const check = (rows: ReturnType<typeof tukeyHsd>, want: RRow[]): void => {
    expect(rows.map((r) => `${r.b}-${r.a}`)).toEqual(want.map((w) => w.comparison));
    for (const w of want) {
      const got = byLabel(rows, w.comparison);
      expect(Math.abs((got?.diff as number) - w.diff)).toBeLessThan(1e-12);
      expect(rel(got?.lower as number, w.lwr)).toBeLessThan(1e-8);
      expect(rel(got?.upper as number, w.upr)).toBeLessThan(1e-8);
      expect(Math.abs((got?.p as number) - w.pAdj)).toBeLessThan(2e-9);
    }
  };

  it('reproduces the tension term (df 48)', () => {
    expect(error.dfError).toBe(48);
    check(tukeyHsd(groups(wb.data.rows, (r) => r[2], (r) => r[0], ['L', 'M', 'H']), error), wb.tukeyHSDTwoWay.terms.tension);
  });

  it('reproduces the 15 wool:tension cell comparisons', () => {
    const order = ['A:L', 'B:L', 'A:M', 'B:M', 'A:H', 'B:H'];
    check(tukeyHsd(groups(wb.data.rows, (r) => `${r[1]}:${r[2]}`, (r) => r[0], order), error), wb.tukeyHSDTwoWay.terms['wool:tension']);
  });
});

describe('tukeyHsd, ToothGrowth dose from the two-way model (df 54, tiny p-values)', () => {
  const error = cellModelError(tg.data.rows, (r) => `${r[1]}:${r[2]}`, (r) => r[0]);
  const rows = tukeyHsd(groups(tg.data.rows, (r) => String(r[2]), (r) => r[0], ['0.5', '1', '2']), error);

  it('matches SciPy\'s interval bounds to 1e-12 relative', () => {
    // SciPy 1.17.1 (crosscheck-independent.json) lwr: 6.362487524864627, 12.727487524864625, 3.597487524864621
    expect(rel(rows[0].lower, 6.362487524864627)).toBeLessThan(1e-12);
    expect(rel(rows[1].lower, 12.727487524864625)).toBeLessThan(1e-12);
    expect(rel(rows[2].lower, 3.597487524864621)).toBeLessThan(1e-12);
  });

  it('keeps adjusted p-values far below 1e-9 (R and SciPy lose them in 1 - cdf)', () => {
    // R's pAdj (ToothGrowth.json) is 1 - ptukey: good to ~1e-12 absolute only (README); SciPy gives 0
    // for 2-0.5. Both R values must agree with ours to that absolute accuracy.
    for (const w of tg.tukeyHSDDoseFromTwoWay.comparisons) {
      const got = byLabel(rows, w.comparison);
      expect(Math.abs((got?.p as number) - w.pAdj)).toBeLessThan(2e-12);
    }
    expect(rows[1].p).toBeGreaterThan(0);
  });

  it('matches 30-digit mpmath values of the adjusted p-values to 1e-12 relative', () => {
    // mpmath 1.3.0 at 30 digits, P(Q_{3,54} > |diff|/se) as the double integral over the chi density
    // and k ∫ φ(z) [Q(z)^(k-1) - (Φ(z+w) - Φ(z))^(k-1)] dz, with MSE = 712.106/54 (R's residual SS,
    // ToothGrowth.json); computed by the author of this test (not stored in shared/)
    expect(rel(rows[0].p, 3.548393643755399147e-10)).toBeLessThan(1e-12);
    expect(rel(rows[1].p, 1.8512822733982458922e-18)).toBeLessThan(1e-12);
  });
});

describe('tukeyHsd input checks', () => {
  it('rejects bad groups and options with StatsInputError naming the value', () => {
    const g = [{ label: 'a', values: [1, 2, 3] }, { label: 'b', values: [2, 3, 5] }];
    expect(() => tukeyHsd([g[0]])).toThrow(/two groups, got 1/);
    expect(() => tukeyHsd([g[0], { label: 'a', values: [1, 2] }])).toThrow(/"a" appears twice/);
    expect(() => tukeyHsd([g[0], { label: 'c', values: [] }])).toThrow(/"c" has no values/);
    expect(() => tukeyHsd([g[0], { label: 'c', values: [1, Number.NaN] }])).toThrow(/NaN/);
    expect(() => tukeyHsd(g, { mse: 2 })).toThrow(/together/);
    expect(() => tukeyHsd(g, { mse: -1, dfError: 4 })).toThrow(/mse.*-1/);
    expect(() => tukeyHsd(g, { confLevel: 95 })).toThrow(/confLevel.*95/);
    expect(() => tukeyHsd([{ label: 'a', values: [1] }, { label: 'b', values: [2] }])).toThrow(StatsInputError);
  });
});
