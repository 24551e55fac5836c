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
import { incompleteGamma } from './special-functions';

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

/**
 * The former normal tail, kept as an independent reference for the rational approximation: Q(z) =
 * Q(1/2, z²/2)/2 by the incomplete gamma function (series + 1 - P below x = 1.5, continued fraction
 * above). Its own error, measured against mpmath at 50 digits: up to 2e-14 near z = √3 (the series
 * stops at a 1e-15 step and 1 - P magnifies that ~10x) and ~z²ε/2 in the far tail, because its
 * exponent a ln x - x - ln Γ(a) is rounded at a magnitude of up to 722 (1.6e-13 at z = 36).
 */
function normalUpperTailByGamma(z: number): number {
  if (Number.isNaN(z)) return NaN;
  if (z === 0) return 0.5;
  const half = incompleteGamma(0.5, (z * z) / 2).upper / 2;
  return z > 0 ? half : 1 - half;
}

const MIN_NORMAL = 2.2250738585072014e-308;
const SUBNORMAL_ULP = 5e-324;

// mpmath 1.3.0, erfc(z/sqrt(2))/2 at mp.dps = 50, printed to 17 digits (reference library; the
// points straddle the 0.66291 and sqrt(32) splits of the approximation and reach the subnormals).
const MPMATH_Q: [number, number][] = [
  [-8, 0.99999999999999938],
  [-3.5, 0.99976737092096447],
  [-1, 0.84134474606854295],
  [-0.5, 0.6914624612740131],
  [-0.001, 0.50039894221391106],
  [0.25, 0.40129367431707628],
  [0.66291, 0.25369409838973994],
  [0.6629100000000001, 0.2536940983897399],
  [1, 0.15865525393145705],
  [1.7108, 0.043559019795771369],
  [2.5, 6.2096653257761352e-3],
  [4, 3.1671241833119921e-5],
  [5.656854248, 7.7086290171404708e-9],
  [5.656854249, 7.7086289722454276e-9],
  [7.5, 3.1908916729108962e-14],
  [12, 1.776482112077679e-33],
  [20, 2.7536241186062337e-89],
  [27.5, 8.7781705568780838e-167],
  [33, 4.0611856209158551e-239],
  [36.5, 5.5447257130748446e-292],
  [37.5, 4.6053530095819548e-308],
  [38, 2.8854283600687843e-316],
  [38.4, 6.601599854326768e-323],
];

describe('normalUpperTail (Cody rational approximation)', () => {
  it.each(MPMATH_Q)('matches mpmath at z = %s', (z, q) => {
    // mpmath at 50 digits (MPMATH_Q). Cody's approximations are designed for 18 digits; 2e-15 allows
    // for the ~5 roundings of double evaluation. Subnormal results carry only absolute precision.
    if (q >= MIN_NORMAL) expect(relErr(normalUpperTail(z), q)).toBeLessThan(2e-15);
    else expect(Math.abs(normalUpperTail(z) - q)).toBeLessThanOrEqual(2 * SUBNORMAL_ULP);
  });

  it('agrees with the incomplete-gamma form over [-8, 38] within that form\'s own error', () => {
    // Reference: normalUpperTailByGamma (above). Tolerance 3e-14 + ε z²: the reference's measured
    // error model (series step near √3, exponent rounding in the tail), not slack for the new code,
    // which the mpmath test holds to 2e-15.
    let worst = 0;
    for (let i = 0; i <= 46000; i++) {
      const z = -8 + i * 1e-3 + (i % 7) * 1.3e-5;
      const ref = normalUpperTailByGamma(z);
      const tol = (3e-14 + 2.2e-16 * z * z) * Math.max(ref, MIN_NORMAL) + 2 * SUBNORMAL_ULP;
      const diff = Math.abs(normalUpperTail(z) - ref);
      worst = Math.max(worst, diff / tol);
    }
    expect(worst).toBeLessThan(1);
  });

  it('agrees with the incomplete-gamma form to 1e-14 where that form is well conditioned', () => {
    // z < 0 (Q near 1) and 2 <= z <= 5 (continued fraction, exponent below 12.5): the reference is
    // good to ~1e-15 there (against mpmath), so the literal 1e-14 bound applies.
    for (let i = 0; i <= 13000; i++) {
      const z = -8 + i * 1e-3;
      if (z >= 0 && z < 2) continue;
      expect(relErr(normalUpperTail(z), normalUpperTailByGamma(z))).toBeLessThan(1e-14);
    }
  });

  it('shows why the comparison above is not 1e-14 everywhere: the old form drifts in the far tail', () => {
    // mpmath 1.3.0 at 50 digits: Q(36.5) = 5.5447257130748446e-292 (MPMATH_Q)
    expect(relErr(normalUpperTailByGamma(36.5), 5.5447257130748446e-292)).toBeGreaterThan(1e-14);
    expect(relErr(normalUpperTail(36.5), 5.5447257130748446e-292)).toBeLessThan(2e-15);
  });

  it('gives published values', () => {
    // qnorm(0.975) = 1.959963984540054 (from memory; standard table value 1.95996)
    expect(relErr(normalUpperTail(1.959963984540054), 0.025)).toBeLessThan(1e-15);
    // pnorm(5, lower.tail = FALSE) = 2.866515718791939e-7 (from memory; tables: 2.8665e-7)
    expect(relErr(normalUpperTail(5), 2.866515718791939e-7)).toBeLessThan(1e-15);
    // pnorm(10, lower.tail = FALSE) = 7.619853024160527e-24 (from memory)
    expect(relErr(normalUpperTail(10), 7.619853024160527e-24)).toBeLessThan(1e-15);
  });

  it('handles the edges', () => {
    // exact by symmetry and limits (definition of the normal tail)
    expect(normalUpperTail(0)).toBe(0.5);
    expect(normalUpperTail(Infinity)).toBe(0);
    expect(normalUpperTail(-Infinity)).toBe(1);
    // mpmath 1.3.0: Q(38.5) = 1.408e-324, under half the smallest subnormal, so it rounds to 0
    expect(normalUpperTail(38.5)).toBe(0);
    expect(normalUpperTail(41)).toBe(0);
    expect(normalUpperTail(NaN)).toBeNaN();
  });
});

describe('normal and t tails', () => {
  it('gives the 2.5 % point of the standard normal', () => {
    // qnorm(0.975) = 1.959963984540054 (from memory; standard table value 1.95996)
    expect(relErr(normalUpperQuantile(0.025), 1.959963984540054)).toBeLessThan(1e-13);
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
