/**
 * Factorial linear model with any main effects and interactions, and its ANOVA table with Type I,
 * II or III sums of squares.
 *
 * The fit is the weighted least-squares regression of the cell means on sum-to-zero coded columns
 * (cell-stats.ts explains why that equals the run-level fit), factorised by a Householder QR that sets
 * aside aliased columns (householder-qr.ts). Sums of squares are formed as squared effects Q'z of
 * projections, never as differences of residual sums of squares, so no digits cancel:
 * - Type I (sequential): each term after the terms before it, in the order given.
 * - Type II: each term after all terms that do not contain it (its higher-order relatives excluded).
 * - Type III: each term after all other terms, with sum-to-zero coding.
 * The residual SS is the pooled within-cell SS plus the squared effects beyond the rank.
 *
 * Caution: with unbalanced data the three types test different hypotheses; Type III with empty cells
 * tests hypotheses that depend on which cells are missing. The numbers inform a judgement by someone
 * who knows the experiment; they do not replace it.
 */
import { buildCellTable, emptyCellLabels, isBalanced, type CellTable, type CodedFactor } from './cell-stats.js';
import { fUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';
import { qrCoefficients, qrResidualSs, sequentialQr } from './householder-qr.js';
import { containsTerm, parseTerms, termColumns, type ModelTerm } from './model-terms.js';
import type { AnovaEffectRow, AnovaRow, LinearModelResult, OmittedTerm, SsType } from './types.js';

export interface LinearModelInput {
  /** responses, one per run (already shifted/centred by the caller or not; the fit is shift-invariant) */
  y: ArrayLike<number>;
  factors: CodedFactor[];
  /** terms such as `A`, `B`, `A:B`; order matters for Type I */
  terms: string[];
  ssType: SsType;
}

/**
 * Check what every model needs: distinct factor names, two or more levels each, data at every level,
 * finite responses.
 * @throws StatsInputError naming the offending factor, level or value
 */
export function validateModelInput(y: ArrayLike<number>, factors: CodedFactor[]): void {
  const names = new Set<string>();
  for (const f of factors) {
    if (names.has(f.name)) throw new StatsInputError(`factor '${f.name}' is named twice`, f.name);
    names.add(f.name);
    if (f.levels.length < 2) {
      throw new StatsInputError(`factor '${f.name}' has fewer than two levels (${f.levels.join(', ') || 'none'})`, f.name);
    }
    const seen = new Uint8Array(f.levels.length);
    for (let i = 0; i < f.codes.length; i++) seen[f.codes[i]] = 1;
    const missing = f.levels.findIndex((_, i) => seen[i] === 0);
    if (missing >= 0) throw new StatsInputError(`level '${f.levels[missing]}' of factor '${f.name}' has no data`, f.levels[missing]);
  }
  for (let i = 0; i < y.length; i++) {
    if (!Number.isFinite(y[i])) throw new StatsInputError(`run ${i + 1}: response ${y[i]} is not a finite number`, y[i]);
  }
}

interface TermColumns {
  term: ModelTerm;
  columns: Float64Array[];
}

/** Number of accepted columns of each block when the blocks are factorised in the order given. */
function acceptedPerBlock(blocks: Float64Array[][], z: Float64Array): number[] {
  const qr = sequentialQr(blocks.flat(), z);
  const out: number[] = [];
  let pos = 0;
  for (const b of blocks) {
    out.push(qr.accepted.slice(pos, pos + b.length).filter(Boolean).length);
    pos += b.length;
  }
  return out;
}

/** The earlier terms whose removal lets more of term `t`'s columns be estimated: its alias partners. */
function aliasPartners(intercept: Float64Array, all: TermColumns[], t: number, z: Float64Array, base: number): string[] {
  const partners: string[] = [];
  for (let s = 0; s < t; s++) {
    const blocks = [[intercept], ...all.slice(0, t).filter((_, i) => i !== s).map((tc) => tc.columns), all[t].columns];
    const counts = acceptedPerBlock(blocks, z);
    if (counts[counts.length - 1] > base) partners.push(all[s].term.name);
  }
  return partners;
}

/** Sum of squared effects of the last block when the blocks are factorised in order, and its df. */
function lastBlockSs(blocks: Float64Array[][], z: Float64Array): { ss: number; df: number } {
  const qr = sequentialQr(blocks.flat(), z);
  const lastLen = blocks[blocks.length - 1].length;
  const total = qr.accepted.length;
  const before = qr.accepted.slice(0, total - lastLen).filter(Boolean).length;
  let ss = 0;
  let df = 0;
  for (let j = total - lastLen; j < total; j++) {
    if (!qr.accepted[j]) continue;
    ss += qr.effects[before + df] ** 2;
    df++;
  }
  return { ss, df };
}

/**
 * Fit the model and build its ANOVA table.
 * @param input responses, coded factors, terms and SS type
 * @param precomputed a CellTable of the same y and factors, if the caller already has one
 * @returns the typed result (see types.ts): rows, notes, omitted terms, fitted values, residuals
 * @throws StatsInputError for bad factors/levels/values, unknown or repeated terms, no residual df,
 *   or a model that fits every run exactly
 * @example fitLinearModel({ y, factors: [wool, tension], terms: ['wool', 'tension', 'wool:tension'], ssType: 2 })
 */
export function fitLinearModel(input: LinearModelInput, precomputed?: CellTable): LinearModelResult {
  const { y, factors, ssType } = input;
  validateModelInput(y, factors);
  const table = precomputed ?? buildCellTable(y, factors);
  const parsed = parseTerms(input.terms, factors.map((f) => f.name));
  const rootN = table.cellN.map(Math.sqrt);
  const z = new Float64Array(table.cellCount);
  for (let c = 0; c < table.cellCount; c++) z[c] = rootN[c] * (table.cellMean[c] - table.grandMean);
  const intercept = Float64Array.from(rootN);
  const allTerms: TermColumns[] = parsed.map((term) => ({ term, columns: termColumns(term, table, rootN) }));

  // Pass 1: sequential factorisation in the given order decides which columns are estimable.
  const main = sequentialQr([intercept, ...allTerms.flatMap((t) => t.columns)], z);
  const notes: string[] = [];
  const omitted: OmittedTerm[] = [];
  const kept: TermColumns[] = [];
  let pos = 1;
  allTerms.forEach((tc, t) => {
    const flags = main.accepted.slice(pos, pos + tc.columns.length);
    pos += tc.columns.length;
    const estimable = flags.filter(Boolean).length;
    if (estimable < tc.columns.length) {
      const partners = aliasPartners(intercept, allTerms, t, z, estimable);
      const withWhat = partners.length ? partners.join(', ') : 'the terms before it or the empty cells';
      if (estimable === 0) {
        const reason = `${tc.term.name} is completely aliased with ${withWhat}: not estimable, so it has no row in the table`;
        omitted.push({ source: tc.term.name, reason });
        notes.push(reason);
        return;
      }
      notes.push(
        `${tc.term.name}: only ${estimable} of ${tc.columns.length} df are estimable (partly aliased with ${withWhat}); the test uses ${estimable} df`,
      );
    }
    kept.push({ term: tc.term, columns: tc.columns.filter((_, j) => flags[j]) });
  });

  const rank = main.rank;
  const residualDf = table.n - rank;
  if (residualDf < 1) {
    throw new StatsInputError(
      `zero residual degrees of freedom: ${table.n} runs and ${rank} estimable parameters in the model ${input.terms.join(' + ') || '(intercept only)'}`,
      residualDf,
    );
  }
  let withinSs = 0;
  for (let c = 0; c < table.cellCount; c++) withinSs += table.cellSs[c];
  const rss = withinSs + qrResidualSs(main);
  if (!(rss > 0)) throw new StatsInputError('the residual sum of squares is 0 (every run equals its fitted value): F tests are undefined', rss);
  const mse = rss / residualDf;

  const keptBlocks = kept.map((k) => k.columns);
  const rows: AnovaEffectRow[] = kept.map((k, t) => {
    let ss: number;
    let df: number;
    if (ssType === 1) {
      ({ ss, df } = lastBlockSs([[intercept], ...keptBlocks.slice(0, t + 1)], z));
    } else {
      const others = kept.filter((o, s) => s !== t && (ssType === 3 || !containsTerm(o.term, k.term))).map((o) => o.columns);
      ({ ss, df } = lastBlockSs([[intercept], ...others, k.columns], z));
    }
    const ms = ss / df;
    const f = ms / mse;
    return { source: k.term.name, df, ss, ms, f, p: fUpperTail(f, df, residualDf), partialEtaSq: ss / (ss + rss) };
  });

  const { fitted, residuals } = fittedAndResiduals(y, table, main, [intercept, ...allTerms.flatMap((t) => t.columns)], rootN);
  const balanced = isBalanced(table);
  notes.push(...modelNotes(ssType, balanced, kept.map((k) => k.term.name), emptyCellsOfTerms(table, parsed)));
  const anova: AnovaRow[] = [...rows, { source: 'Residual', df: residualDf, ss: rss, ms: mse }];
  return {
    ssType,
    terms: kept.map((k) => k.term.name),
    anova,
    omitted,
    notes,
    residualDf,
    mse,
    residualSd: Math.sqrt(mse),
    rSquared: table.totalSs > 0 ? 1 - rss / table.totalSs : 0,
    rank,
    columns: 1 + allTerms.reduce((s, t) => s + t.columns.length, 0),
    balanced,
    fitted,
    residuals,
  };
}

/** Fitted value per cell from the QR coefficients, spread back to the runs. */
function fittedAndResiduals(
  y: ArrayLike<number>,
  table: CellTable,
  qr: ReturnType<typeof sequentialQr>,
  columns: Float64Array[],
  rootN: Float64Array,
): { fitted: Float64Array; residuals: Float64Array } {
  const b = qrCoefficients(qr);
  const cellFit = new Float64Array(table.cellCount);
  let j = 0;
  columns.forEach((col, i) => {
    if (!qr.accepted[i]) return;
    for (let c = 0; c < table.cellCount; c++) cellFit[c] += col[c] * b[j];
    j++;
  });
  for (let c = 0; c < table.cellCount; c++) cellFit[c] /= rootN[c];
  const base = table.shift + table.grandMean;
  const fitted = new Float64Array(table.n);
  const residuals = new Float64Array(table.n);
  for (let i = 0; i < table.n; i++) {
    const c = table.cellOfRun[i];
    fitted[i] = base + cellFit[c];
    residuals[i] = y[i] - table.shift - table.grandMean - cellFit[c];
  }
  return { fitted, residuals };
}

/**
 * Empty combinations of the factors of each interaction term that is not contained in a larger one
 * (an empty A:B cell is also an empty A:B:C cell, so only the largest term is listed). Crossings no term asks for, e.g. block x
 * treatment in a blocked design, are not reported: their cells are empty by design.
 */
function emptyCellsOfTerms(table: CellTable, terms: ModelTerm[]): { term: string; cells: string[] }[] {
  return terms
    .filter((t) => t.factors.length > 1 && !terms.some((o) => containsTerm(o, t)))
    .map((t) => ({ term: t.name, cells: emptyCellLabels(table, t.factors) }))
    .filter((e) => e.cells.length > 0);
}

function modelNotes(ssType: SsType, balanced: boolean, terms: string[], empty: { term: string; cells: string[] }[]): string[] {
  const notes: string[] = [];
  for (const e of empty) notes.push(`empty cells of ${e.term} (no runs): ${e.cells.join(', ')}; terms involving them lose df`);
  if (balanced) notes.push('balanced design: Type I, II and III sums of squares coincide');
  else if (ssType === 1) notes.push(`Type I (sequential) sums of squares: each term after those before it, in the order ${terms.join(', ')}`);
  else if (ssType === 2) notes.push('Type II sums of squares: each term adjusted for all terms that do not contain it');
  else {
    notes.push('Type III sums of squares: each term adjusted for all others, sum-to-zero coding');
    if (empty.length > 0) notes.push('caution: with empty cells the Type III hypotheses depend on which cells are missing');
  }
  return notes;
}
