/**
 * Model terms (main effects and interactions of any order) and their sum-to-zero coded columns,
 * evaluated on the observed cells of a CellTable.
 *
 * Coding: a factor with k levels gets k - 1 columns; column j is +1 for level j, -1 for the last
 * level, 0 otherwise (R's contr.sum). Interaction columns are products of their factors' columns.
 * Sum-to-zero coding makes each column orthogonal to the intercept in a balanced design and is what
 * Type III sums of squares require (with treatment coding Type III tests the wrong hypothesis);
 * Type I and II sums of squares do not depend on the coding.
 */
import type { CellTable, CodedFactor } from './cell-stats.js';
import { StatsInputError } from './errors.js';

/** A term as the indices (into the model's factor list) of its factors, ascending. */
export interface ModelTerm {
  /** display name, factor names in model order joined by ':' */
  name: string;
  factors: number[];
}

/**
 * Parse term strings such as `A`, `B:A`, `A:B:C` against the model's factors; the factors of a term
 * are put in model order, so `B:A` and `A:B` are the same term.
 * @throws StatsInputError for an unknown factor, a factor repeated inside a term, or a repeated term
 */
export function parseTerms(terms: string[], factorNames: string[]): ModelTerm[] {
  const out: ModelTerm[] = [];
  const seen = new Set<string>();
  for (const raw of terms) {
    const parts = raw.split(':').map((p) => p.trim());
    const idx: number[] = [];
    for (const part of parts) {
      const i = factorNames.indexOf(part);
      if (i < 0) throw new StatsInputError(`term '${raw}' names '${part}', which is not one of the factors (${factorNames.join(', ')})`, raw);
      if (idx.includes(i)) throw new StatsInputError(`term '${raw}' names factor '${part}' twice`, raw);
      idx.push(i);
    }
    idx.sort((a, b) => a - b);
    const name = idx.map((i) => factorNames[i]).join(':');
    if (seen.has(name)) throw new StatsInputError(`term '${raw}' is given twice (as '${name}')`, raw);
    seen.add(name);
    out.push({ name, factors: idx });
  }
  return out;
}

/**
 * All main effects and interactions of the factors, ordered by degree then lexicographically in
 * factor order (A, B, C, A:B, A:C, B:C, A:B:C), the conventional order of a full factorial model.
 */
export function fullFactorialTerms(factorNames: string[]): string[] {
  const k = factorNames.length;
  const subsets: number[][] = [];
  for (let mask = 1; mask < 1 << k; mask++) {
    const s: number[] = [];
    for (let i = 0; i < k; i++) if (mask & (1 << i)) s.push(i);
    subsets.push(s);
  }
  subsets.sort((a, b) => a.length - b.length || compareLex(a, b));
  return subsets.map((s) => s.map((i) => factorNames[i]).join(':'));
}

function compareLex(a: number[], b: number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i] - b[i];
  return 0;
}

/** Whether `outer` contains every factor of `inner` and more (outer is a higher-order relative). */
export function containsTerm(outer: ModelTerm, inner: ModelTerm): boolean {
  return outer.factors.length > inner.factors.length && inner.factors.every((f) => outer.factors.includes(f));
}

/** Sum-to-zero code of level `level` in contrast column `j` of a factor with `k` levels. */
function sumCode(level: number, j: number, k: number): number {
  if (level === j) return 1;
  return level === k - 1 ? -1 : 0;
}

/**
 * The coded columns of a term over the observed cells, each multiplied by sqrt(n_c) (the weighted
 * cell-mean regression).
 */
export function termColumns(term: ModelTerm, table: CellTable, rootN: Float64Array): Float64Array[] {
  const factors: CodedFactor[] = term.factors.map((f) => table.factors[f]);
  const sizes = factors.map((f) => f.levels.length - 1);
  const total = sizes.reduce((a, b) => a * b, 1);
  const columns: Float64Array[] = [];
  const js = new Array<number>(sizes.length).fill(0);
  for (let col = 0; col < total; col++) {
    let rest = col;
    for (let t = 0; t < sizes.length; t++) {
      js[t] = rest % sizes[t];
      rest = Math.floor(rest / sizes[t]);
    }
    const v = new Float64Array(table.cellCount);
    for (let c = 0; c < table.cellCount; c++) {
      let prod = rootN[c];
      for (let t = 0; t < sizes.length && prod !== 0; t++) {
        prod *= sumCode(table.cellLevels[term.factors[t]][c], js[t], sizes[t] + 1);
      }
      v[c] = prod;
    }
    columns.push(v);
  }
  return columns;
}
