import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { welchAnova } from './welch.js';

// R 4.2.2 oneway.test(breaks ~ tension, var.equal = FALSE) (shared/reference/r-datasets/warpbreaks.json)
const wb = JSON.parse(readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/warpbreaks.json'), 'utf8')) as {
  data: { rows: [number, string, string][] }; welchOneWayTension: { f: number; df1: number; df2: number; p: number };
};
const byTension = ['L', 'M', 'H'].map((t) => wb.data.rows.filter((r) => r[2] === t).map((r) => r[0]));
const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

describe('welchAnova', () => {
  it('matches R oneway.test on warpbreaks tension', () => {
    // 1e-12: R's 15 digits; the independent recomputation agrees to 6e-16 (crosscheck-independent.json)
    const got = welchAnova(byTension);
    const want = wb.welchOneWayTension;
    expect(got.df1).toBe(want.df1);
    expect(rel(got.df2, want.df2)).toBeLessThan(1e-12);
    expect(rel(got.f, want.f)).toBeLessThan(1e-12);
    expect(rel(got.p, want.p)).toBeLessThan(1e-12);
  });

  it('reduces to the square of Welch\'s t for two groups', () => {
    // For k = 2, F = t_W² and df2 = the Welch–Satterthwaite df (Welch 1951); computed here from the
    // textbook two-sample formulas, independently of the k-group code path
    const a = [10.1, 12.3, 9.8, 11.4, 10.9];
    const b = [14.2, 13.1, 16.8, 15.5, 12.9, 17.3];
    const mv = (x: number[]): [number, number] => {
      const m = x.reduce((s, v) => s + v, 0) / x.length;
      return [m, x.reduce((s, v) => s + (v - m) ** 2, 0) / (x.length - 1)];
    };
    const [ma, va] = mv(a);
    const [mb, vb] = mv(b);
    const se2 = va / a.length + vb / b.length;
    const t2 = (ma - mb) ** 2 / se2;
    const df = se2 ** 2 / ((va / a.length) ** 2 / (a.length - 1) + (vb / b.length) ** 2 / (b.length - 1));
    const got = welchAnova([a, b]);
    expect(rel(got.f, t2)).toBeLessThan(1e-13);
    expect(rel(got.df2, df)).toBeLessThan(1e-13);
  });

  it('rejects constant or tiny groups, naming the group', () => {
    expect(() => welchAnova([[1, 2, 3], [5, 5, 5]])).toThrow(/group #2 is constant/);
    expect(() => welchAnova([[1], [5, 6]])).toThrow(/group #1 has 1/);
  });
});
