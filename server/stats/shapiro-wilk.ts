/**
 * Shapiro–Wilk test of normality, by Royston's algorithm AS R94 (Royston 1995, Applied Statistics
 * 44, 547–551), valid for 3 <= n <= 5000. No maintained npm package implements it, so this is our
 * own code, validated against R's `shapiro.test` (which is AS R94) and SciPy's `shapiro`
 * (shared/reference/r-datasets/warpbreaks.json shapiroResidualsTwoWay, crosscheck-independent.json).
 *
 * Outline of AS R94:
 * - the coefficients a_i come from normal scores m_i = Φ⁻¹((i - 3/8)/(n + 1/4)), with the two most
 *   extreme coefficients replaced by Royston's polynomial approximations in u = 1/√n;
 * - W is the squared correlation between the ordered sample and the coefficients, formed as 1 - W
 *   ("w1") so it keeps its digits when W is near 1;
 * - p: exact for n = 3; otherwise ln(1 - W) (n >= 12) or -ln(γ - ln(1 - W)) (4 <= n <= 11) is
 *   treated as normal with mean and log-sd given by polynomials in n or ln n.
 * The polynomial coefficients below are Royston's published constants as they appear in AS R94.
 *
 * Caution: with many residuals, tiny departures from normality become "significant"; look at the
 * normal probability plot as well, and with few residuals the test has little power.
 */
import { normalUpperQuantile, normalUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';

// Royston (1995) AS R94 polynomial coefficients (lowest order first).
const G = [-2.273, 0.459];
const C1 = [0, 0.221157, -0.147981, -2.07119, 4.434685, -2.706056];
const C2 = [0, 0.042981, -0.293762, -1.752461, 5.682633, -3.582633];
const C3 = [0.544, -0.39978, 0.025054, -6.714e-4];
const C4 = [1.3822, -0.77857, 0.062767, -0.0020322];
const C5 = [-1.5861, -0.31082, -0.083751, 0.0038915];
const C6 = [-0.4803, -0.082676, 0.0030302];
// p reported when W lies beyond the small-sample transformation (R returns this "obvious" value too)
const SMALL = 1e-99;

/** Polynomial with coefficients c (c[0] constant term), in the evaluation order of AS 181.2. */
function poly(c: number[], x: number): number {
  if (c.length === 1) return c[0];
  let p = x * c[c.length - 1];
  for (let j = c.length - 2; j > 0; j--) p = (p + c[j]) * x;
  return c[0] + p;
}

/** Result of the Shapiro–Wilk test. */
export interface ShapiroWilkResult {
  /** the W statistic, in (0, 1] */
  w: number;
  /** p-value (small p: evidence against normality) */
  p: number;
}

/**
 * AS R94 coefficients a[1..n/2] (1-based, a[0] unused), for the upper half of the ordered sample.
 */
function coefficients(n: number): number[] {
  const nn2 = Math.floor(n / 2);
  const a = new Array<number>(nn2 + 1).fill(0);
  if (n === 3) {
    a[1] = Math.SQRT1_2;
    return a;
  }
  const an25 = n + 0.25;
  let summ2 = 0;
  for (let i = 1; i <= nn2; i++) {
    // lower normal score m_i = Φ⁻¹((i - 3/8)/(n + 1/4)) < 0
    a[i] = -normalUpperQuantile((i - 0.375) / an25);
    summ2 += a[i] * a[i];
  }
  summ2 *= 2;
  const ssumm2 = Math.sqrt(summ2);
  const rsn = 1 / Math.sqrt(n);
  const a1 = poly(C1, rsn) - a[1] / ssumm2;
  let i1: number;
  let fac: number;
  if (n > 5) {
    i1 = 3;
    const a2 = -a[2] / ssumm2 + poly(C2, rsn);
    fac = Math.sqrt((summ2 - 2 * a[1] * a[1] - 2 * a[2] * a[2]) / (1 - 2 * a1 * a1 - 2 * a2 * a2));
    a[2] = a2;
  } else {
    i1 = 2;
    fac = Math.sqrt((summ2 - 2 * a[1] * a[1]) / (1 - 2 * a1 * a1));
  }
  a[1] = a1;
  for (let i = i1; i <= nn2; i++) a[i] /= -fac;
  return a;
}

/**
 * Shapiro–Wilk W and p-value (Royston's AS R94).
 * @param x sample (e.g. model residuals), 3 to 5000 finite values, not all equal
 * @returns {w, p}
 * @throws StatsInputError for n outside 3..5000, a non-finite value, or zero range
 * @example shapiroWilk([2.1, 3.4, 1.9, 5.6, 4.4, 3.0, 2.7]) // W = 0.92834, p = 0.5369 (SciPy shapiro: 0.92834, 0.5369)
 */
export function shapiroWilk(x: number[]): ShapiroWilkResult {
  if (!Array.isArray(x) || x.length < 3 || x.length > 5000) {
    throw new StatsInputError(`Shapiro-Wilk needs 3 to 5000 values, got ${Array.isArray(x) ? x.length : x}`, x);
  }
  for (const v of x) if (!Number.isFinite(v)) throw new StatsInputError(`Shapiro-Wilk: value ${v} is not a finite number`, v);
  const s = [...x].sort((p, q) => p - q);
  const n = s.length;
  const range = s[n - 1] - s[0];
  // R refuses a range below 1e-10 as "all values identical"; relative to the data's magnitude is
  // the honest version of that test for doubles.
  if (!(range > 1e-10 * Math.max(1, Math.abs(s[0]), Math.abs(s[n - 1])))) {
    throw new StatsInputError(`Shapiro-Wilk needs values that differ; all are (nearly) equal to ${s[0]}`, s[0]);
  }
  const a = coefficients(n);
  // signed coefficient of the i-th order statistic (0-based): -a for the lower half, +a for the upper
  const coef = (i: number): number => {
    const j = n - 1 - i;
    if (i === j) return 0;
    return i < j ? -a[1 + i] : a[1 + j];
  };
  let sa = 0;
  let sx = 0;
  for (let i = 0; i < n; i++) {
    sa += coef(i);
    sx += s[i] / range;
  }
  sa /= n;
  sx /= n;
  let ssa = 0;
  let ssx = 0;
  let sax = 0;
  for (let i = 0; i < n; i++) {
    const asa = coef(i) - sa;
    const xsx = s[i] / range - sx;
    ssa += asa * asa;
    ssx += xsx * xsx;
    sax += asa * xsx;
  }
  // 1 - W computed without subtracting two numbers near 1 (AS R94)
  const ssassx = Math.sqrt(ssa * ssx);
  const w1 = ((ssassx - sax) * (ssassx + sax)) / (ssa * ssx);
  const w = 1 - w1;
  return { w, p: pValue(n, w, w1) };
}

function pValue(n: number, w: number, w1: number): number {
  if (n === 3) {
    // exact: p = (6/π) (asin √W - asin √(3/4))
    return Math.max(0, (6 / Math.PI) * (Math.asin(Math.sqrt(w)) - Math.PI / 3));
  }
  let y = Math.log(w1);
  let m: number;
  let sd: number;
  if (n <= 11) {
    const gamma = poly(G, n);
    // beyond the range of the small-sample transformation: W is so far from 1 that p is negligible
    if (y >= gamma) return SMALL;
    y = -Math.log(gamma - y);
    m = poly(C3, n);
    sd = Math.exp(poly(C4, n));
  } else {
    const ln = Math.log(n);
    m = poly(C5, ln);
    sd = Math.exp(poly(C6, ln));
  }
  return normalUpperTail((y - m) / sd);
}
