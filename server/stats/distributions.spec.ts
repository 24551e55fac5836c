import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  chiSquareUpperTail,
  formatP,
  fUpperQuantile,
  fUpperTail,
  jStat,
  normalUpperQuantile,
  normalUpperTail,
  tTwoSided,
  tUpperQuantile,
} from './distributions';

interface RTableRow {
  term: string;
  df: number;
  f: number | null;
  p: number | null;
}

function loadReference<T>(relative: string): T {
  return JSON.parse(fs.readFileSync(path.resolve(process.cwd(), '../shared/reference', relative), 'utf8')) as T;
}

function relErr(x: number, ref: number): number {
  return Math.abs(x - ref) / Math.abs(ref);
}

interface AnovaRef {
  table: RTableRow[];
}
const warpbreaks = loadReference<{
  twoWay: AnovaRef;
  oneWayTension: AnovaRef;
  bartlettTension: { statistic: number; df: number; p: number };
  bartlettCells: { statistic: number; df: number; p: number };
  kruskalTension: { statistic: number; df: number; p: number };
  kruskalCells: { statistic: number; df: number; p: number };
  welchOneWayTension: { f: number; df1: number; df2: number; p: number };
}>('r-datasets/warpbreaks.json');
const toothGrowth = loadReference<{ twoWay: AnovaRef; oneWayDose: AnovaRef }>('r-datasets/ToothGrowth.json');
const powerRef = loadReference<{ rows: { df1: number; df2: number; fCritHighPrecision: number }[] }>(
  'r-datasets/power-oneway.json',
);

/** All (F, df1, df2, p) rows of an R ANOVA table, the residual df taken from its last row. */
function fRows(ref: AnovaRef): { term: string; f: number; df1: number; df2: number; p: number }[] {
  const residual = ref.table[ref.table.length - 1];
  return ref.table
    .filter((r) => r.f !== null && r.p !== null)
    .map((r) => ({ term: r.term, f: r.f as number, df1: r.df, df2: residual.df, p: r.p as number }));
}

describe('fUpperTail', () => {
  const cases = [
    ...fRows(warpbreaks.twoWay),
    ...fRows(warpbreaks.oneWayTension),
    ...fRows(toothGrowth.twoWay),
    ...fRows(toothGrowth.oneWayDose),
  ];
  it.each(cases)('matches R pf(lower.tail = FALSE) for $term (F = $f)', ({ f, df1, df2, p }) => {
    // R 4.2.2 summary(aov(...)) p-values (shared/reference/r-datasets/warpbreaks.json, ToothGrowth.json),
    // printed to 15 digits; 1e-12 leaves room for the 15-digit rounding of F itself.
    expect(relErr(fUpperTail(f, df1, df2), p)).toBeLessThan(1e-12);
  });

  it('keeps a p-value of 4e-18 that 1 - cdf (jstat) loses entirely', () => {
    // R 4.2.2 summary(aov(len ~ supp * factor(dose))): factor(dose) p = 4.04629119599216e-18 (ToothGrowth.json)
    const dose = fRows(toothGrowth.twoWay).find((r) => r.term === 'factor(dose)');
    expect(dose).toBeDefined();
    const { f, df1, df2, p } = dose as { f: number; df1: number; df2: number; p: number };
    expect(relErr(fUpperTail(f, df1, df2), p)).toBeLessThan(1e-12);
    // This is why the engine does not use jstat's cdf for p-values: the tail is rounded to 0.
    expect(1 - jStat.centralF.cdf(f, df1, df2)).toBe(0);
  });

  it('is tighter than jstat, whose beta continued fraction stops at a 3e-7 step', () => {
    // R 4.2.2 summary(aov(breaks ~ wool * tension)): wool F = 3.76528836111863, p = 0.0582129759595598
    const wool = fRows(warpbreaks.twoWay)[0];
    expect(relErr(fUpperTail(wool.f, wool.df1, wool.df2), wool.p)).toBeLessThan(1e-12);
    expect(relErr(1 - jStat.centralF.cdf(wool.f, wool.df1, wool.df2), wool.p)).toBeGreaterThan(1e-9);
  });

  it('matches the Welch one-way p-value with fractional df2', () => {
    // R 4.2.2 oneway.test(breaks ~ tension, var.equal = FALSE) (warpbreaks.json)
    const w = warpbreaks.welchOneWayTension;
    expect(relErr(fUpperTail(w.f, w.df1, w.df2), w.p)).toBeLessThan(1e-12);
  });

  it('handles the edges', () => {
    expect(fUpperTail(0, 3, 10)).toBe(1);
    expect(fUpperTail(Infinity, 3, 10)).toBe(0);
    expect(() => fUpperTail(1, 0, 10)).toThrow(/df1 must be > 0, got 0/);
  });
});

describe('chiSquareUpperTail', () => {
  const cases = [
    { name: 'bartlett tension', ...warpbreaks.bartlettTension },
    { name: 'bartlett cells', ...warpbreaks.bartlettCells },
    { name: 'kruskal tension', ...warpbreaks.kruskalTension },
    { name: 'kruskal cells', ...warpbreaks.kruskalCells },
  ];
  it.each(cases)('matches R pchisq(lower.tail = FALSE) for $name', ({ statistic, df, p }) => {
    // R 4.2.2 bartlett.test / kruskal.test statistic and p (warpbreaks.json)
    expect(relErr(chiSquareUpperTail(statistic, df), p)).toBeLessThan(1e-12);
  });

  it('equals the closed form exp(-x/2) for 2 df, also far in the tail', () => {
    // chi-square with 2 df is exponential with mean 2: P(X > x) = exp(-x/2) (textbook identity)
    for (const x of [0.1, 3, 40, 900]) expect(relErr(chiSquareUpperTail(x, 2), Math.exp(-x / 2))).toBeLessThan(1e-13);
  });
});

describe('normal and t tails', () => {
  it('gives the 2.5 % point of the standard normal', () => {
    // qnorm(0.975) = 1.959963984540054 (from memory; standard table value 1.95996)
    expect(relErr(normalUpperTail(1.959963984540054), 0.025)).toBeLessThan(1e-13);
    expect(relErr(normalUpperQuantile(0.025), 1.959963984540054)).toBeLessThan(1e-13);
  });

  it('gives a tail of 7.6e-24 at z = 10 without underflow to 0', () => {
    // pnorm(10, lower.tail = FALSE) = 7.619853024160527e-24 (from memory)
    expect(relErr(normalUpperTail(10), 7.619853024160527e-24)).toBeLessThan(1e-12);
  });

  it('satisfies P(|T| > t) = P(F(1, df) > t^2)', () => {
    // identity T^2 ~ F(1, df) (textbook); compared against the F tail validated against R above
    for (const [t, df] of [
      [0.3, 4],
      [2.5, 30],
      [9, 7],
    ])
      expect(relErr(tTwoSided(t, df), fUpperTail(t * t, 1, df))).toBeLessThan(1e-14);
  });

  it('gives t quantiles for confidence intervals', () => {
    // qt(0.975, 10) = 2.228138851986274 (from memory; tables: 2.228)
    expect(relErr(tUpperQuantile(0.025, 10), 2.228138851986274)).toBeLessThan(1e-12);
    expect(tUpperQuantile(0.975, 10)).toBeCloseTo(-tUpperQuantile(0.025, 10), 14);
  });
});

describe('fUpperQuantile', () => {
  it.each(powerRef.rows.slice(0, 27))('matches mpmath qf(0.95, $df1, $df2)', ({ df1, df2, fCritHighPrecision }) => {
    // mpmath 1.3.0 at 40 digits, fCritHighPrecision (shared/reference/r-datasets/power-oneway.json)
    expect(relErr(fUpperQuantile(0.05, df1, df2), fCritHighPrecision)).toBeLessThan(1e-13);
  });
});

describe('formatP', () => {
  it('reports tiny p-values as a bound', () => {
    // common practice, no source: a double carries no meaningful digits below ~1e-16 here
    expect(formatP(4.05e-18)).toBe('p < 1e-16');
    expect(formatP(0.0582129759595598)).toBe('p = 0.0582');
    expect(formatP(0.000692620936713445)).toBe('p = 6.93e-4');
  });
});
