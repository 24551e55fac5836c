/**
 * Levene's test for equal variances (absolute deviations from the group mean) and the
 * Brown–Forsythe variant (absolute deviations from the group median, robust to skewed data).
 *
 * Both are the one-way ANOVA F test on z_ij = |x_ij - c_i| (Levene 1960; Brown & Forsythe 1974),
 * with df1 = k - 1 and df2 = N - k. This is what R's `anova(lm(z ~ g))` and SciPy's
 * `levene(center=...)` compute (shared/reference/r-datasets/warpbreaks.json, leveneMean*,
 * brownForsytheMedian*).
 *
 * Caution: a non-significant result does not prove equal variances, least of all with few runs.
 */
import { fUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';

/** An F test: statistic, degrees of freedom and upper-tail p-value. */
export interface FTest {
  f: number;
  df1: number;
  df2: number;
  p: number;
}

/**
 * Validate the groups of a one-factor comparison: at least two groups, each with at least
 * `minPerGroup` values, every value finite. Shared by the assumption checks and post-hoc tests.
 * @throws StatsInputError naming the offending group or value
 */
export function checkGroups(groups: number[][], minPerGroup: number, test: string): void {
  if (!Array.isArray(groups) || groups.length < 2) {
    throw new StatsInputError(`${test} needs at least two groups, got ${Array.isArray(groups) ? groups.length : groups}`, groups);
  }
  groups.forEach((g, i) => {
    if (g.length < minPerGroup) {
      throw new StatsInputError(`${test} needs at least ${minPerGroup} value(s) in every group; group #${i + 1} has ${g.length}`, i);
    }
    for (const v of g) {
      if (!Number.isFinite(v)) throw new StatsInputError(`${test}: group #${i + 1} contains ${v}; every value must be a finite number`, v);
    }
  });
}

function mean(x: number[]): number {
  let s = 0;
  for (const v of x) s += v;
  const m = s / x.length;
  // second pass: add the mean of the residuals, which removes most of the first pass's rounding
  let r = 0;
  for (const v of x) r += v - m;
  return m + r / x.length;
}

/** Median (mean of the two middle values for even n). */
export function median(x: number[]): number {
  const s = [...x].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 === 1 ? s[h] : (s[h - 1] + s[h]) / 2;
}

/**
 * One-way ANOVA F of already-formed groups, centred two-pass sums of squares.
 * @throws StatsInputError when there is no within-group variation (F undefined)
 */
export function oneWayF(groups: number[][], test: string): FTest {
  const k = groups.length;
  const n = groups.reduce((s, g) => s + g.length, 0);
  const means = groups.map(mean);
  const grand = mean(groups.flat());
  let between = 0;
  let within = 0;
  groups.forEach((g, i) => {
    between += g.length * (means[i] - grand) ** 2;
    for (const v of g) within += (v - means[i]) ** 2;
  });
  const df1 = k - 1;
  const df2 = n - k;
  if (df2 < 1) throw new StatsInputError(`${test} needs more values than groups (N = ${n}, k = ${k})`, n);
  if (!(within > 0)) throw new StatsInputError(`${test} is undefined: no variation within the groups`, within);
  const f = between / df1 / (within / df2);
  return { f, df1, df2, p: fUpperTail(f, df1, df2) };
}

/**
 * Levene (center 'mean') or Brown–Forsythe (center 'median') test of equal group variances.
 * @param groups the response values of each group
 * @param center 'mean' for Levene's original test, 'median' for Brown–Forsythe
 * @returns {f, df1, df2, p}
 * @throws StatsInputError for fewer than two groups, an empty group, a non-finite value, or no spread
 * @example levene([[1, 2, 3], [2, 4, 6]], 'mean') // F(1, 4) = 0.8, p = 0.4216 (SciPy levene)
 */
export function levene(groups: number[][], center: 'mean' | 'median'): FTest {
  const name = center === 'mean' ? 'Levene test' : 'Brown-Forsythe test';
  if (center !== 'mean' && center !== 'median') throw new StatsInputError(`center must be "mean" or "median", got "${String(center)}"`, center);
  checkGroups(groups, 1, name);
  const z = groups.map((g) => {
    const c = center === 'mean' ? mean(g) : median(g);
    return g.map((v) => Math.abs(v - c));
  });
  return oneWayF(z, name);
}
