/**
 * Tukey HSD comparisons per model term, using the fitted model's residual mean square and degrees
 * of freedom as the error estimate (the convention of R's `TukeyHSD` on an `aov` fit), rather than
 * the pooled variance of the groups compared. For a main effect the groups are that factor's levels;
 * for an interaction `A:B` they are the cells of A x B. With unequal group sizes the Tukey–Kramer
 * form is used (tukey.ts). For balanced data this reproduces R exactly; for unbalanced data R's
 * `TukeyHSD` compares `model.tables` means, which can differ slightly from the raw level means used
 * here (documented choice: the raw means are the ones shown on the main-effect charts).
 */
import type { CodedFactor } from './cell-stats.js';
import { StatsInputError } from './errors.js';
import { tukeyHsd } from './tukey.js';
import type { TukeyComparison } from './types.js';

export interface TermTukey {
  term: string;
  comparisons: TukeyComparison[];
}

/**
 * @param y responses (any common shift is harmless: Tukey uses differences)
 * @param factors coded factors of the model
 * @param terms fitted terms, e.g. ['A', 'B', 'A:B']
 * @param mse residual mean square of the model
 * @param dfError residual degrees of freedom of the model
 * @param confLevel family-wise confidence level, e.g. 0.95
 * @returns one entry per term, comparisons labelled by level (or `a:b` for cells)
 * @throws StatsInputError for a term naming an unknown factor, or from tukeyHsd for bad groups
 * @example tukeyByTerm(y, factors, ['tension'], 119.69, 48, 0.95)
 */
export function tukeyByTerm(
  y: ArrayLike<number>,
  factors: CodedFactor[],
  terms: string[],
  mse: number,
  dfError: number,
  confLevel: number,
): TermTukey[] {
  return terms.map((term) => {
    const parts = term.split(':').map((name) => {
      const f = factors.find((x) => x.name === name);
      if (!f) throw new StatsInputError(`term '${term}' names an unknown factor '${name}'`, term);
      return f;
    });
    const groups = new Map<string, number[]>();
    // Cell order: the first factor varies fastest (A:L, B:L, A:M, ...), the order R's TukeyHSD uses,
    // so that each comparison reads 'later - earlier' exactly as R labels it.
    let keys: string[][] = [[]];
    for (const f of parts) keys = f.levels.flatMap((lvl) => keys.map((k) => [...k, lvl]));
    const labels = keys.map((k) => k.join(':'));
    for (const k of labels) groups.set(k, []);
    for (let r = 0; r < y.length; r++) {
      const key = parts.map((f) => f.levels[f.codes[r]!]).join(':');
      groups.get(key)!.push(y[r]!);
    }
    const nonEmpty = labels.filter((k) => groups.get(k)!.length > 0).map((k) => ({ label: k, values: groups.get(k)! }));
    return { term, comparisons: tukeyHsd(nonEmpty, { mse, dfError, confLevel }) };
  });
}
