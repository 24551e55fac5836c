/**
 * Bartlett's test for equal variances (Bartlett 1937), in the form of R's `bartlett.test` and
 * SciPy's `bartlett` (shared/reference/r-datasets/warpbreaks.json bartlettTension, bartlettCells):
 *
 *   K² = [(N - k) ln s_p² - Σ (n_i - 1) ln s_i²] / C,
 *   C  = 1 + (Σ 1/(n_i - 1) - 1/(N - k)) / (3 (k - 1)),
 *
 * referred to chi-square with k - 1 df (upper tail computed directly).
 *
 * Caution: Bartlett's test is very sensitive to non-normality; prefer Brown–Forsythe when the
 * residuals are skewed or heavy-tailed.
 */
import { chiSquareUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';
import { checkGroups } from './levene.js';

/** A chi-square test: statistic, df and upper-tail p-value. */
export interface ChiSquareTest {
  statistic: number;
  df: number;
  p: number;
}

/** Unbiased sample variance by the two-pass (centred) formula. */
function variance(x: number[]): number {
  let s = 0;
  for (const v of x) s += v;
  const m = s / x.length;
  let ss = 0;
  let r = 0;
  for (const v of x) {
    ss += (v - m) ** 2;
    r += v - m;
  }
  // corrected two-pass algorithm (Chan, Golub & LeVeque 1983): subtract the squared residual sum
  return (ss - (r * r) / x.length) / (x.length - 1);
}

/**
 * Bartlett's test of equal variances across groups.
 * @param groups the response values of each group (each with >= 2 values and non-zero spread)
 * @returns {statistic: K², df: k - 1, p}
 * @throws StatsInputError for fewer than two groups, a group with < 2 values, a constant group, or a non-finite value
 * @example bartlett([[1, 2, 3, 4], [2, 4, 6, 8]]) // K² = 1.1476, df 1, p = 0.2841 (SciPy bartlett)
 */
export function bartlett(groups: number[][]): ChiSquareTest {
  checkGroups(groups, 2, 'Bartlett test');
  const k = groups.length;
  const variances = groups.map(variance);
  variances.forEach((v, i) => {
    if (!(v > 0)) throw new StatsInputError(`Bartlett test needs spread in every group; group #${i + 1} is constant`, i);
  });
  let dfTotal = 0;
  let pooledSS = 0;
  let sumLog = 0;
  let sumRecip = 0;
  groups.forEach((g, i) => {
    const df = g.length - 1;
    dfTotal += df;
    pooledSS += df * variances[i];
    sumLog += df * Math.log(variances[i]);
    sumRecip += 1 / df;
  });
  const pooled = pooledSS / dfTotal;
  const c = 1 + (sumRecip - 1 / dfTotal) / (3 * (k - 1));
  const statistic = (dfTotal * Math.log(pooled) - sumLog) / c;
  return { statistic, df: k - 1, p: chiSquareUpperTail(statistic, k - 1) };
}
