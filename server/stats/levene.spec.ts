import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { StatsInputError } from './errors.js';
import { levene } from './levene.js';

// R 4.2.2 datasets::warpbreaks with anova(lm(z ~ g)) results (shared/reference/r-datasets/warpbreaks.json)
interface FRef { f: number; df1: number; df2: number; p: number }
const wb = JSON.parse(readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/warpbreaks.json'), 'utf8')) as {
  data: { rows: [number, string, string][] };
  leveneMeanTension: FRef; brownForsytheMedianTension: FRef; leveneMeanCells: FRef; brownForsytheMedianCells: FRef;
};
function groupBy(key: (r: [number, string, string]) => string): number[][] {
  const m = new Map<string, number[]>();
  for (const r of wb.data.rows) m.set(key(r), [...(m.get(key(r)) ?? []), r[0]]);
  return [...m.values()];
}
const byTension = groupBy((r) => r[2]);
const byCell = groupBy((r) => `${r[1]}:${r[2]}`);
const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

describe('levene', () => {
  // Tolerance 1e-12 relative: R prints 15 digits and SciPy agrees with R to 3e-15 on these
  // (crosscheck-independent.json), so the reference is good to ~1e-14.
  it.each([
    ['mean', 'tension', byTension, wb.leveneMeanTension],
    ['median', 'tension', byTension, wb.brownForsytheMedianTension],
    ['mean', 'cells', byCell, wb.leveneMeanCells],
    ['median', 'cells', byCell, wb.brownForsytheMedianCells],
  ] as const)('center %s over warpbreaks %s matches R', (center, _what, groups, want) => {
    const got = levene(groups, center);
    expect([got.df1, got.df2]).toEqual([want.df1, want.df2]);
    expect(rel(got.f, want.f)).toBeLessThan(1e-12);
    expect(rel(got.p, want.p)).toBeLessThan(1e-12);
  });

  it('matches SciPy levene for the tension groups', () => {
    // SciPy 1.17.1 levene(center='mean'/'median') (crosscheck-independent.json)
    expect(rel(levene(byTension, 'mean').f, 7.344055848740079)).toBeLessThan(1e-13);
    expect(rel(levene(byTension, 'median').f, 2.8180476658944493)).toBeLessThan(1e-13);
  });

  it('is unchanged by a shift of all data', () => {
    // location invariance is a property of the test (absolute deviations), no source needed
    const shifted = byTension.map((g) => g.map((v) => v + 1e6));
    expect(rel(levene(shifted, 'mean').f, wb.leveneMeanTension.f)).toBeLessThan(1e-9);
  });

  it('rejects bad input with StatsInputError naming the value', () => {
    expect(() => levene([[1, 2, 3]], 'mean')).toThrow(/two groups, got 1/);
    expect(() => levene([[1, 2], []], 'mean')).toThrow(/group #2 has 0/);
    expect(() => levene([[1, Number.NaN], [2, 3]], 'median')).toThrow(/NaN/);
    expect(() => levene([[1, 1], [2, 2]], 'mean')).toThrow(StatsInputError);
    expect(() => levene([[1, 2], [2, 3]], 'mode' as 'mean')).toThrow(/"mode"/);
  });
});
