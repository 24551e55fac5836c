/**
 * Welch's one-way ANOVA for unequal group variances (Welch 1951), the test of R's
 * `oneway.test(var.equal = FALSE)` (shared/reference/r-datasets/warpbreaks.json welchOneWayTension):
 *
 *   w_i = n_i / s_i²,  m = Σ w_i ȳ_i / Σ w_i,  A = Σ w_i (ȳ_i - m)² / (k - 1),
 *   t = Σ (1 - w_i / Σ w)² / (n_i - 1),
 *   F = A / (1 + 2 (k - 2) t / (k² - 1)),  df1 = k - 1,  df2 = (k² - 1) / (3 t).
 *
 * df2 is not an integer; the F tail handles that.
 */
import { fUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';
import { checkGroups, type FTest } from './levene.js';

function meanAndVariance(x: number[]): { mean: number; variance: number } {
  let s = 0;
  for (const v of x) s += v;
  const m = s / x.length;
  let ss = 0;
  let r = 0;
  for (const v of x) {
    ss += (v - m) ** 2;
    r += v - m;
  }
  return { mean: m + r / x.length, variance: (ss - (r * r) / x.length) / (x.length - 1) };
}

/**
 * Welch's heteroscedastic one-way ANOVA.
 * @param groups the response values of each group (each with >= 2 values and non-zero spread)
 * @returns {f, df1, df2, p}
 * @throws StatsInputError for fewer than two groups, a group with < 2 values, a constant group, or a non-finite value
 * @example welchAnova([[1, 2, 3], [4, 6, 8]]) // F(1, 2.94) = 9.6, p = 0.0548
 */
export function welchAnova(groups: number[][]): FTest {
  checkGroups(groups, 2, 'Welch ANOVA');
  const k = groups.length;
  const stats = groups.map(meanAndVariance);
  stats.forEach((s, i) => {
    if (!(s.variance > 0)) throw new StatsInputError(`Welch ANOVA needs spread in every group; group #${i + 1} is constant`, i);
  });
  const w = stats.map((s, i) => groups[i].length / s.variance);
  const sumW = w.reduce((a, b) => a + b, 0);
  const m = stats.reduce((acc, s, i) => acc + w[i] * s.mean, 0) / sumW;
  const a = stats.reduce((acc, s, i) => acc + w[i] * (s.mean - m) ** 2, 0) / (k - 1);
  const t = w.reduce((acc, wi, i) => acc + (1 - wi / sumW) ** 2 / (groups[i].length - 1), 0);
  const f = a / (1 + (2 * (k - 2) * t) / (k * k - 1));
  const df1 = k - 1;
  const df2 = (k * k - 1) / (3 * t);
  return { f, df1, df2, p: fUpperTail(f, df1, df2) };
}
