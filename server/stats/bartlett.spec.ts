import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { bartlett } from './bartlett.js';

// R 4.2.2 bartlett.test on datasets::warpbreaks (shared/reference/r-datasets/warpbreaks.json)
interface ChiRef { statistic: number; df: number; p: number }
const wb = JSON.parse(readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/warpbreaks.json'), 'utf8')) as {
  data: { rows: [number, string, string][] }; bartlettTension: ChiRef; bartlettCells: ChiRef;
};
function groupBy(key: (r: [number, string, string]) => string): number[][] {
  const m = new Map<string, number[]>();
  for (const r of wb.data.rows) m.set(key(r), [...(m.get(key(r)) ?? []), r[0]]);
  return [...m.values()];
}
const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

describe('bartlett', () => {
  it('matches R bartlett.test over tension and over the six cells', () => {
    // 1e-12: R's 15 digits and SciPy agree to 4e-14 here (crosscheck-independent.json)
    for (const [groups, want] of [
      [groupBy((r) => r[2]), wb.bartlettTension],
      [groupBy((r) => `${r[1]}:${r[2]}`), wb.bartlettCells],
    ] as const) {
      const got = bartlett(groups);
      expect(got.df).toBe(want.df);
      expect(rel(got.statistic, want.statistic)).toBeLessThan(1e-12);
      expect(rel(got.p, want.p)).toBeLessThan(1e-12);
    }
  });

  it('matches SciPy bartlett on the tension groups', () => {
    // SciPy 1.17.1 bartlett K2 = 9.657118138413413 (crosscheck-independent.json)
    expect(rel(bartlett(groupBy((r) => r[2])).statistic, 9.657118138413413)).toBeLessThan(1e-13);
  });

  it('is invariant to a common scale and shift of the data', () => {
    // property of the statistic (ratios of variances), no source needed
    const g = groupBy((r) => r[2]).map((x) => x.map((v) => 1000 + v / 7));
    expect(rel(bartlett(g).statistic, wb.bartlettTension.statistic)).toBeLessThan(1e-10);
  });

  it('rejects groups that are too small, constant or non-finite', () => {
    expect(() => bartlett([[1, 2, 3], [4]])).toThrow(/group #2 has 1/);
    expect(() => bartlett([[1, 2, 3], [4, 4, 4]])).toThrow(/group #2 is constant/);
    expect(() => bartlett([[1, 2, Infinity], [4, 5]])).toThrow(/Infinity/);
    expect(() => bartlett([[1, 2]])).toThrow(/two groups/);
  });
});
