/**
 * The noncentral F distribution, needed for the power of F tests (jstat has none).
 *
 * With x = df1 f / (df1 f + df2), the noncentral F with noncentrality λ is a Poisson(λ/2) mixture of
 * central Beta(df1/2 + j, df2/2) laws (Johnson, Kotz & Balakrishnan, Continuous Univariate
 * Distributions vol. 2, ch. 30):
 *
 *   P(F <= f) = Σ_j w_j I_x(df1/2 + j, df2/2),   w_j = e^{-λ/2} (λ/2)^j / j!
 *
 * Each term's incomplete beta is evaluated directly (special-functions.ts, continued fraction to
 * ~1e-15) rather than by the usual forward recurrence, so no term inherits rounding from its
 * neighbours; both tails are summed separately from their own directly computed tail, so the upper
 * tail (the power) keeps its relative accuracy even when it is tiny. The sum starts at the Poisson
 * mode and walks outwards in both directions until a geometric bound on the rest is below 1e-17 of
 * the running sum — this also keeps the first weight from underflowing when λ is large.
 */
import { StatsInputError } from './errors.js';
import { incompleteBeta, lgamma, lgammaCorrection, log1pmx } from './special-functions.js';

const LN_2PI = Math.log(2 * Math.PI);
const REL_STOP = 1e-17;
const MAX_TERMS = 1_000_000;

/** Both tails of the noncentral F at one point. */
export interface NoncentralFTails {
  /** P(F <= f) */
  lower: number;
  /** P(F > f), computed as its own sum (not 1 - lower) */
  upper: number;
}

/**
 * ln of the Poisson probability e^{-mu} mu^j / j!, in Loader's saddle-point form for j >= 10
 * (j ln(mu/j) + j - mu = j log1pmx((mu - j)/j)) so that the three large terms do not cancel.
 */
function logPoisson(j: number, mu: number): number {
  if (j === 0) return -mu;
  if (j < 10) return j * Math.log(mu) - mu - lgamma(j + 1);
  return j * log1pmx((mu - j) / j) - 0.5 * (LN_2PI + Math.log(j)) - lgammaCorrection(j);
}

function checkArgs(f: number, df1: number, df2: number, ncp: number): void {
  if (Number.isNaN(f)) throw new StatsInputError(`F value must be a number, got ${f}`, f);
  if (!(df1 > 0) || !Number.isFinite(df1)) throw new StatsInputError(`df1 must be a positive finite number, got ${df1}`, df1);
  if (!(df2 > 0) || !Number.isFinite(df2)) throw new StatsInputError(`df2 must be a positive finite number, got ${df2}`, df2);
  if (!(ncp >= 0) || !Number.isFinite(ncp)) {
    throw new StatsInputError(`noncentrality must be a finite number >= 0, got ${ncp}`, ncp);
  }
}

/**
 * Sum w_j * tail_j outward from the mode. `increasing` says whether tail_j grows with j (the upper
 * tail of Beta(a + j, b) at fixed x does; the lower tail shrinks). The bound on what is left uses
 * w_{j±i} <= w_j r^i (Poisson ratios beyond the mode) and the monotone tail: the tail in the walking
 * direction is bounded by the current tail value when it shrinks that way and by 1 otherwise.
 */
function mixtureSum(mu: number, tailAt: (j: number) => number, increasing: boolean): number {
  const mode = Math.floor(mu);
  const w0 = Math.exp(logPoisson(mode, mu));
  let sum = w0 * tailAt(mode);
  // forward: j = mode + 1, mode + 2, ...
  let w = w0;
  for (let j = mode + 1; j < mode + MAX_TERMS; j++) {
    w *= mu / j;
    const tail = tailAt(j);
    sum += w * tail;
    const r = mu / (j + 1);
    const bound = (w * (increasing ? 1 : tail) * r) / (1 - r);
    if (bound <= REL_STOP * sum || w === 0) break;
  }
  // backward: j = mode - 1, ..., 0
  w = w0;
  for (let j = mode - 1; j >= 0; j--) {
    w *= (j + 1) / mu;
    const tail = tailAt(j);
    sum += w * tail;
    const r = j / mu;
    const bound = (w * (increasing ? tail : 1) * r) / (1 - r);
    if (bound <= REL_STOP * sum || w === 0) break;
  }
  return sum;
}

/**
 * Distribution function and upper tail of the noncentral F distribution.
 * @param f point at which to evaluate (>= 0)
 * @param df1 numerator degrees of freedom (> 0, finite)
 * @param df2 denominator degrees of freedom (> 0, finite)
 * @param ncp noncentrality λ (>= 0); λ = 0 gives the central F
 * @returns `{lower: P(F <= f), upper: P(F > f)}`, each summed directly
 * @throws StatsInputError naming the bad argument
 * @example noncentralFTails(5.3176550715787165, 1, 8, 1.6).upper // 0.2007394526520355 (mpmath, power-oneway.json)
 */
export function noncentralFTails(f: number, df1: number, df2: number, ncp: number): NoncentralFTails {
  checkArgs(f, df1, df2, ncp);
  if (f <= 0) return { lower: 0, upper: 1 };
  if (f === Infinity) return { lower: 1, upper: 0 };
  const denom = df1 * f + df2;
  // x and 1 - x are each formed without subtraction, so neither loses digits when the other is near 1.
  const x = (df1 * f) / denom;
  const y = df2 / denom;
  const a = df1 / 2;
  const b = df2 / 2;
  const mu = ncp / 2;
  if (mu === 0) return incompleteBeta(x, a, b, y);
  const upper = mixtureSum(mu, (j) => incompleteBeta(x, a + j, b, y).upper, true);
  const lower = mixtureSum(mu, (j) => incompleteBeta(x, a + j, b, y).lower, false);
  return { lower, upper };
}

/**
 * P(F <= f) of the noncentral F distribution.
 * @example noncentralFCdf(4.41387341917057, 1, 18, 0.2) // 1 - 0.0708213451893107
 */
export function noncentralFCdf(f: number, df1: number, df2: number, ncp: number): number {
  return noncentralFTails(f, df1, df2, ncp).lower;
}

/**
 * P(F > f) of the noncentral F distribution (the power of an F test when f is its critical value).
 * @example noncentralFUpperTail(5.3176550715787165, 1, 8, 0.1) // 0.05904263425365333 (mpmath)
 */
export function noncentralFUpperTail(f: number, df1: number, df2: number, ncp: number): number {
  return noncentralFTails(f, df1, df2, ncp).upper;
}
