/**
 * Turning analysis rows ({factors: {A: 'lvl'}, value}) into what the engine fits: coded categorical
 * factors and exactly read responses.
 *
 * Factor values are categorical whatever they look like (a dose of "0.5" is a level name, not a
 * number); level order is the caller's (`levels`) or the order of first appearance, which is the
 * order of a run sheet. Responses go through readResponses (decimal-input.ts).
 */
import type { CodedFactor } from './cell-stats.js';
import { readResponses } from './decimal-input.js';
import { StatsInputError } from './errors.js';

/** One run: its factor levels and its measured response (number or decimal text). */
export interface AnalysisRow {
  factors: Record<string, string | number>;
  value: string | number;
}

export interface PreparedData {
  /** responses minus `offset` (exact decimal subtraction when needed) */
  y: Float64Array;
  offset: number;
  offsetText: string;
  factors: CodedFactor[];
}

/**
 * Code the factors and read the responses.
 * @param rows the runs
 * @param factorNames factors to analyse, in model order
 * @param levels optional level order per factor (every level seen in the data must be listed)
 * @throws StatsInputError for no rows, a factor named twice, a missing level, an unknown level, or a
 *   response that is not a finite decimal number — each naming the row and value
 */
export function prepareData(rows: ReadonlyArray<AnalysisRow>, factorNames: string[], levels?: Record<string, string[]>): PreparedData {
  if (rows.length === 0) throw new StatsInputError('no rows to analyse', rows.length);
  const seen = new Set<string>();
  for (const name of factorNames) {
    if (seen.has(name)) throw new StatsInputError(`factor '${name}' is named twice`, name);
    seen.add(name);
  }
  const factors: CodedFactor[] = factorNames.map((name) => codeFactor(rows, name, levels?.[name]));
  const { shifted, offset, offsetText } = readResponses(
    rows.map((r) => r.value),
    (i) => `row ${i + 1}`,
  );
  return { y: shifted, offset, offsetText, factors };
}

function codeFactor(rows: ReadonlyArray<AnalysisRow>, name: string, given?: string[]): CodedFactor {
  const index = new Map<string, number>();
  const levels: string[] = [];
  if (given) {
    given.forEach((l, i) => {
      if (index.has(l)) throw new StatsInputError(`level '${l}' of factor '${name}' is listed twice`, l);
      index.set(l, i);
      levels.push(l);
    });
  }
  const codes = new Int32Array(rows.length);
  rows.forEach((row, i) => {
    const raw = row.factors[name];
    const level = raw === undefined || raw === null ? '' : String(raw).trim();
    if (level === '') throw new StatsInputError(`row ${i + 1}: factor '${name}' has no level`, name);
    let code = index.get(level);
    if (code === undefined) {
      if (given) throw new StatsInputError(`row ${i + 1}: '${level}' is not a listed level of factor '${name}'`, level);
      code = levels.length;
      index.set(level, code);
      levels.push(level);
    }
    codes[i] = code;
  });
  return { name, levels, codes };
}
