import type { AnalysisResult, AnovaEffectRow, PosthocTerm } from '../../shared/analysis.js';
import { StatsInputError } from '../stats/errors.js';
import { tukeyHsd, type TukeyGroup } from '../stats/tukey.js';

/**
 * Post-hoc comparisons for the significant terms only, as R's TukeyHSD(aov(...), which = term) does
 * them: the level means of a main effect (or the cell means of a two-factor interaction) compared
 * pairwise with the fitted model's residual mean square and df, at confidence 1 - alpha.
 * Cells are ordered with the first factor varying fastest, R's order, so comparisons read "B:L-A:L".
 */

/** Pairs grow as k(k-1)/2; beyond this many groups the table stops being readable (and slow). */
export const MAX_POSTHOC_GROUPS = 12;

export interface PosthocRun {
  settings: Record<string, string>;
  value: string;
}

function groupsFor(factors: string[], runs: PosthocRun[], levels: Record<string, string[]>): TukeyGroup[] {
  const orders = factors.map((f) => levels[f] ?? [...new Set(runs.map((r) => r.settings[f]!))]);
  // first factor fastest: each later factor becomes the outer loop over what is built so far
  let combos: string[][] = [[]];
  for (const order of orders) combos = order.flatMap((l) => combos.map((c) => [...c, l]));
  const byKey = new Map<string, number[]>(combos.map((c) => [c.join(':'), []]));
  // Values as doubles: Tukey's differences and intervals do not depend on a common offset, and
  // response magnitudes of this trade are far from the digits doubles lose.
  for (const r of runs) byKey.get(factors.map((f) => r.settings[f]).join(':'))?.push(Number(r.value));
  return [...byKey].filter(([, v]) => v.length > 0).map(([label, values]) => ({ label, values }));
}

export function posthocFor(result: AnalysisResult, runs: PosthocRun[], levels: Record<string, string[]>, alpha: number): { posthoc: PosthocTerm[]; notes: string[] } {
  const notes: string[] = [];
  const posthoc: PosthocTerm[] = [];
  const significant = result.anova.filter((r): r is AnovaEffectRow => r.source !== 'Residual').filter((r) => r.p < alpha);
  for (const row of significant) {
    const factors = row.source.split(':');
    if (factors.length > 2) {
      notes.push(`Tukey HSD not run for ${row.source}: comparisons are offered for main effects and two-factor interactions`);
      continue;
    }
    const groups = groupsFor(factors, runs, levels);
    if (groups.length > MAX_POSTHOC_GROUPS) {
      notes.push(`Tukey HSD not run for ${row.source}: ${groups.length} groups give ${(groups.length * (groups.length - 1)) / 2} pairs; read the interaction plot instead`);
      continue;
    }
    try {
      const comparisons = tukeyHsd(groups, { mse: result.model.mse, dfError: result.model.residualDf, confLevel: 1 - alpha });
      posthoc.push({
        term: row.source,
        groups: groups.map((g) => ({ label: g.label, n: g.values.length, mean: g.values.reduce((a, b) => a + b, 0) / g.values.length })),
        comparisons,
        mse: result.model.mse,
        df: result.model.residualDf,
        confLevel: 1 - alpha,
      });
    } catch (err) {
      // Expected failure: the engine's own input checks (e.g. no residual df); the term keeps its
      // ANOVA row and the reason is shown instead of comparisons.
      if (!(err instanceof StatsInputError)) throw err;
      notes.push(`Tukey HSD not run for ${row.source}: ${err.message}`);
    }
  }
  if (!result.model.balanced && posthoc.length) notes.push('Tukey–Kramer intervals compare raw level means; in an unbalanced design they are not adjusted for the other factors');
  return { posthoc, notes };
}
