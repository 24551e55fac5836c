/**
 * Tukey's honestly significant difference (HSD) for all pairwise comparisons of group means, with
 * the Tukey–Kramer standard error for unequal group sizes (Tukey 1953; Kramer 1956). Same layout
 * as R's `TukeyHSD` (shared/reference/r-datasets/warpbreaks.json, ToothGrowth.json):
 *
 *   diff = ȳ_b - ȳ_a ("b-a", b after a in the given order),
 *   se   = sqrt(MSE/2 · (1/n_a + 1/n_b)),
 *   interval diff ± q_{conf; k, df} · se,   adjusted p = P(Q_{k, df} > |diff| / se),
 *
 * with Q the studentized range (studentized-range.ts; upper tail computed directly, so adjusted
 * p-values of 1e-13 are not rounded to 0). MSE and df default to the pooled within-group variance
 * and N - k; pass the residual mean square and df of a larger model (e.g. a two-way ANOVA) to get
 * R's `TukeyHSD` on that model, which compares the level means of one term with the model's MSE.
 *
 * Caution: with unequal n the Tukey–Kramer intervals are slightly conservative; for levels of one
 * factor in an unbalanced multi-factor study, raw level means are not adjusted for other factors.
 */
import { StatsInputError } from './errors.js';
import { studentizedRangeQuantile, studentizedRangeUpperTail } from './studentized-range.js';

/** A group to compare: its label and its response values. */
export interface TukeyGroup {
  label: string;
  values: number[];
}

/** Options: error mean square and df from a larger model, and the confidence level. */
export interface TukeyOptions {
  mse?: number;
  dfError?: number;
  confLevel?: number;
}

/** One pairwise comparison "b - a". */
export interface TukeyComparison {
  a: string;
  b: string;
  diff: number;
  lower: number;
  upper: number;
  p: number;
}

function meanOf(x: number[]): number {
  let s = 0;
  for (const v of x) s += v;
  const m = s / x.length;
  let r = 0;
  for (const v of x) r += v - m;
  return m + r / x.length;
}

function validate(groups: TukeyGroup[], opts: TukeyOptions): void {
  if (!Array.isArray(groups) || groups.length < 2) {
    throw new StatsInputError(`Tukey HSD needs at least two groups, got ${Array.isArray(groups) ? groups.length : groups}`, groups);
  }
  const labels = new Set<string>();
  for (const g of groups) {
    if (labels.has(g.label)) throw new StatsInputError(`Tukey HSD: group label "${g.label}" appears twice`, g.label);
    labels.add(g.label);
    if (g.values.length === 0) throw new StatsInputError(`Tukey HSD: group "${g.label}" has no values`, g.label);
    for (const v of g.values) {
      if (!Number.isFinite(v)) throw new StatsInputError(`Tukey HSD: group "${g.label}" contains ${v}; values must be finite`, v);
    }
  }
  if ((opts.mse === undefined) !== (opts.dfError === undefined)) {
    throw new StatsInputError('Tukey HSD: give mse and dfError together (both from the same model)', opts);
  }
  if (opts.mse !== undefined && !(opts.mse > 0 && Number.isFinite(opts.mse))) {
    throw new StatsInputError(`Tukey HSD: mse must be a positive number, got ${opts.mse}`, opts.mse);
  }
  if (opts.dfError !== undefined && !(opts.dfError > 0)) {
    throw new StatsInputError(`Tukey HSD: dfError must be > 0, got ${opts.dfError}`, opts.dfError);
  }
  const conf = opts.confLevel ?? 0.95;
  if (!(conf > 0 && conf < 1)) throw new StatsInputError(`Tukey HSD: confLevel must be between 0 and 1, got ${conf}`, conf);
}

/** Pooled within-group variance and its df, N - k (two-pass). */
function pooledError(groups: TukeyGroup[], means: number[]): { mse: number; dfError: number } {
  let ss = 0;
  let n = 0;
  groups.forEach((g, i) => {
    for (const v of g.values) ss += (v - means[i]) ** 2;
    n += g.values.length;
  });
  const dfError = n - groups.length;
  if (dfError < 1) throw new StatsInputError(`Tukey HSD: no error degrees of freedom (${n} values in ${groups.length} groups)`, dfError);
  if (!(ss > 0)) throw new StatsInputError('Tukey HSD: no variation within the groups, the error mean square is 0', ss);
  return { mse: ss / dfError, dfError };
}

/**
 * All pairwise comparisons of group means by Tukey's HSD / Tukey–Kramer.
 * @param groups labelled groups in the order in which comparisons are formed (b after a)
 * @param opts mse and dfError of the error term to use (default: pooled within groups), confLevel (default 0.95)
 * @returns one row per pair (a, b) with diff = mean(b) - mean(a), simultaneous interval and adjusted p
 * @throws StatsInputError for fewer than two groups, repeated labels, empty groups, non-finite values, bad options
 * @example tukeyHsd([{label: 'L', values: [...]}, {label: 'M', values: [...]}, {label: 'H', values: [...]}])
 *   // rows M-L, H-L, H-M as in R's TukeyHSD
 */
export function tukeyHsd(groups: TukeyGroup[], opts: TukeyOptions = {}): TukeyComparison[] {
  validate(groups, opts);
  const k = groups.length;
  const means = groups.map((g) => meanOf(g.values));
  const { mse, dfError } =
    opts.mse !== undefined && opts.dfError !== undefined ? { mse: opts.mse, dfError: opts.dfError } : pooledError(groups, means);
  const qCrit = studentizedRangeQuantile(opts.confLevel ?? 0.95, k, dfError);
  const rows: TukeyComparison[] = [];
  // balanced designs repeat the same |diff|/se often; each tail is a double integral, so reuse it
  const tailCache = new Map<number, number>();
  const tail = (q: number): number => {
    let p = tailCache.get(q);
    if (p === undefined) {
      p = studentizedRangeUpperTail(q, k, dfError);
      tailCache.set(q, p);
    }
    return p;
  };
  for (let i = 0; i < k; i++) {
    for (let j = i + 1; j < k; j++) {
      const diff = means[j] - means[i];
      const se = Math.sqrt((mse / 2) * (1 / groups[i].values.length + 1 / groups[j].values.length));
      const width = qCrit * se;
      rows.push({
        a: groups[i].label,
        b: groups[j].label,
        diff,
        lower: diff - width,
        upper: diff + width,
        p: tail(Math.abs(diff) / se),
      });
    }
  }
  return rows;
}
