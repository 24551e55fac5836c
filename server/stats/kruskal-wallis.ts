/**
 * Kruskal–Wallis rank test (Kruskal & Wallis 1952) with the correction for ties, as in R's
 * `kruskal.test` and SciPy's `kruskal` (shared/reference/r-datasets/warpbreaks.json kruskal*):
 *
 *   H = [12 / (N (N + 1)) Σ R_i² / n_i - 3 (N + 1)] / [1 - Σ (t³ - t) / (N³ - N)],
 *
 * with R_i the rank sum of group i (mid-ranks for ties) and t the size of each tie group; referred
 * to chi-square with k - 1 df (the large-sample approximation; with very small groups an exact
 * table is better).
 */
import type { ChiSquareTest } from './bartlett.js';
import { chiSquareUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';
import { checkGroups } from './levene.js';

/**
 * Kruskal–Wallis H test across groups, tie-corrected.
 * @param groups the response values of each group
 * @returns {statistic: H, df: k - 1, p}
 * @throws StatsInputError for fewer than two groups, an empty group, a non-finite value, or all values tied
 * @example kruskalWallis([[1, 2, 3], [4, 5, 6]]) // H = 3.857, df 1, p = 0.0495 (SciPy kruskal)
 */
export function kruskalWallis(groups: number[][]): ChiSquareTest {
  checkGroups(groups, 1, 'Kruskal-Wallis test');
  const all = groups.flatMap((g, gi) => g.map((value) => ({ value, gi })));
  all.sort((a, b) => a.value - b.value);
  const n = all.length;
  const rankSum = new Array<number>(groups.length).fill(0);
  let tieTerm = 0;
  for (let i = 0; i < n; ) {
    let j = i;
    while (j + 1 < n && all[j + 1].value === all[i].value) j++;
    const t = j - i + 1;
    const midRank = (i + j) / 2 + 1;
    for (let m = i; m <= j; m++) rankSum[all[m].gi] += midRank;
    tieTerm += t * t * t - t;
    i = j + 1;
  }
  const correction = 1 - tieTerm / (n * n * n - n);
  if (!(correction > 0)) throw new StatsInputError('Kruskal-Wallis test is undefined: all values are tied', n);
  const sum = rankSum.reduce((acc, r, i) => acc + (r * r) / groups[i].length, 0);
  const statistic = ((12 * sum) / (n * (n + 1)) - 3 * (n + 1)) / correction;
  const df = groups.length - 1;
  return { statistic, df, p: chiSquareUpperTail(statistic, df) };
}
