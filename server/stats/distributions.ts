/**
 * Upper-tail probabilities and quantiles of the F, t, chi-square and normal distributions.
 *
 * Every tail is computed directly from the regularised incomplete beta / gamma function
 * (special-functions.ts), never as 1 - cdf, so that a p-value of 1e-20 is reported as 1e-20 and
 * not as 0. Quantiles start from jstat's inverse and are polished by safeguarded Newton steps on
 * these accurate tails (jstat's own inverses inherit its 3e-7 continued-fraction tolerance).
 */
import jstatPkg from 'jstat';
import { incompleteBeta, incompleteGamma, lbeta, logBetaPrefactor } from './special-functions.js';

// jstat under real Node ESM exposes only a default export (STACK.md pitfall 7).
const { jStat } = jstatPkg;

export { jStat };

function assertDf(df: number, name: string): void {
  if (!(df > 0) || Number.isNaN(df)) throw new RangeError(`${name} must be > 0, got ${df}`);
}

/**
 * P(F > f) for F ~ F(df1, df2), as I_{df2/(df2 + df1 f)}(df2/2, df1/2).
 * @param f observed F ratio (>= 0; NaN gives NaN)
 * @param df1 numerator degrees of freedom (> 0)
 * @param df2 denominator degrees of freedom (> 0; Infinity allowed: chi-square limit)
 * @returns upper-tail probability
 * @throws RangeError for non-positive degrees of freedom
 * @example fUpperTail(3.76528836111863, 1, 48) // 0.0582129759595598 (R pf(..., lower.tail = FALSE))
 */
export function fUpperTail(f: number, df1: number, df2: number): number {
  assertDf(df1, 'df1');
  assertDf(df2, 'df2');
  if (Number.isNaN(f)) return NaN;
  if (f <= 0) return 1;
  if (f === Infinity) return 0;
  if (df2 === Infinity) return chiSquareUpperTail(f * df1, df1);
  // x and 1 - x are both formed without subtraction, so neither loses digits.
  const denom = df2 + df1 * f;
  return incompleteBeta(df2 / denom, df2 / 2, df1 / 2, (df1 * f) / denom).lower;
}

/**
 * Two-sided p-value P(|T| > |t|) for Student's t with df degrees of freedom (= P(F(1, df) > t^2)).
 * @example tTwoSided(2.0085591, 50) // ~0.05
 */
export function tTwoSided(t: number, df: number): number {
  assertDf(df, 'df');
  if (Number.isNaN(t)) return NaN;
  if (df === Infinity) return 2 * normalUpperTail(Math.abs(t));
  const t2 = t * t;
  const denom = df + t2;
  return incompleteBeta(df / denom, df / 2, 0.5, t2 / denom).lower;
}

/** One-sided upper tail P(T > t) of Student's t. */
export function tUpperTail(t: number, df: number): number {
  const half = tTwoSided(t, df) / 2;
  return t >= 0 ? half : 1 - half;
}

/**
 * P(X > x) for X ~ chi-square(df): the upper regularised gamma Q(df/2, x/2), computed directly
 * (continued fraction when x/2 > df/2 + 1).
 * @example chiSquareUpperTail(9.65711813841333, 2) // 0.00799803758549638 (R bartlett.test)
 */
export function chiSquareUpperTail(x: number, df: number): number {
  assertDf(df, 'df');
  if (Number.isNaN(x)) return NaN;
  if (x <= 0) return 1;
  return incompleteGamma(df / 2, x / 2).upper;
}

/**
 * P(Z > z) for the standard normal, as Q(1/2, z^2/2) / 2 for z >= 0 (erfc without cancellation).
 * @example normalUpperTail(1.959963984540054) // 0.025
 */
export function normalUpperTail(z: number): number {
  if (Number.isNaN(z)) return NaN;
  if (z === 0) return 0.5;
  const half = incompleteGamma(0.5, (z * z) / 2).upper / 2;
  return z > 0 ? half : 1 - half;
}

/** Density of Student's t (for Newton steps). */
function tDensity(t: number, df: number): number {
  return Math.exp(-((df + 1) / 2) * Math.log1p((t * t) / df) - lbeta(df / 2, 0.5)) / Math.sqrt(df);
}

/** Density of F(df1, df2) at f > 0 (for Newton steps). */
function fDensity(f: number, df1: number, df2: number): number {
  const denom = df2 + df1 * f;
  return Math.exp(logBetaPrefactor((df1 * f) / denom, df2 / denom, df1 / 2, df2 / 2)) / f;
}

/**
 * Solve upperTail(q) = target for q > 0 where upperTail decreases from 1 to 0: Newton steps kept
 * inside a shrinking bracket, falling back to bisection (robust for the flat df1 = 1 F density).
 */
function solveUpper(
  target: number,
  start: number,
  upperTail: (q: number) => number,
  density: (q: number) => number,
): number {
  let lo = 0;
  let hi = Infinity;
  let q = start > 0 && Number.isFinite(start) ? start : 1;
  for (let iter = 0; iter < 200; iter++) {
    const diff = upperTail(q) - target;
    if (diff === 0) return q;
    if (diff > 0) lo = q;
    else hi = q;
    let next = q + diff / density(q);
    if (!(next > lo && next < hi) || !Number.isFinite(next)) next = hi === Infinity ? 2 * q : (lo + hi) / 2;
    if (Math.abs(next - q) <= 1e-15 * q) return next;
    q = next;
  }
  return q;
}

function assertProbability(p: number, name: string): void {
  if (!(p > 0 && p < 1)) throw new RangeError(`${name} must be strictly between 0 and 1, got ${p}`);
}

/**
 * Quantile t with P(T > t) = upper, e.g. tUpperQuantile(0.025, df) for a 95 % confidence interval.
 * @throws RangeError when upper is not in (0, 1)
 * @example tUpperQuantile(0.025, 10) // 2.228138851986274 (R qt(0.975, 10))
 */
export function tUpperQuantile(upper: number, df: number): number {
  assertProbability(upper, 'tail probability');
  assertDf(df, 'df');
  if (upper === 0.5) return 0;
  if (upper > 0.5) return -tUpperQuantile(1 - upper, df);
  if (df === Infinity) return normalUpperQuantile(upper);
  const start = jStat.studentt.inv(1 - upper, df);
  return solveUpper(upper, start, (t) => tUpperTail(t, df), (t) => tDensity(t, df));
}

/**
 * Quantile f with P(F > f) = upper (critical value of the F test at level `upper`).
 * @example fUpperQuantile(0.05, 2, 51) // critical F of a 3-group one-way ANOVA with 54 runs
 */
export function fUpperQuantile(upper: number, df1: number, df2: number): number {
  assertProbability(upper, 'tail probability');
  assertDf(df1, 'df1');
  assertDf(df2, 'df2');
  const start = jStat.centralF.inv(1 - upper, df1, Math.min(df2, 1e7));
  return solveUpper(upper, start, (f) => fUpperTail(f, df1, df2), (f) => fDensity(f, df1, df2));
}

/** Quantile z with P(Z > z) = upper. */
export function normalUpperQuantile(upper: number): number {
  assertProbability(upper, 'tail probability');
  if (upper === 0.5) return 0;
  if (upper > 0.5) return -normalUpperQuantile(1 - upper);
  const start = jStat.normal.inv(1 - upper, 0, 1);
  const density = (z: number): number => Math.exp((-z * z) / 2) / Math.sqrt(2 * Math.PI);
  return solveUpper(upper, start, normalUpperTail, density);
}

/** Below this a double-precision p-value carries no meaningful digits for reporting. */
export const P_FLOOR = 1e-16;

/**
 * Format a p-value for people: "p < 1e-16" below the floor, three significant digits otherwise
 * (scientific notation under 0.001).
 * @example formatP(0.0582129759595598) // "p = 0.0582"
 * @example formatP(4.0e-18) // "p < 1e-16"
 */
export function formatP(p: number): string {
  if (Number.isNaN(p)) return 'p not available';
  if (p < P_FLOOR) return 'p < 1e-16';
  if (p < 0.001) return `p = ${p.toExponential(2)}`;
  return `p = ${Number(p.toPrecision(3))}`;
}
