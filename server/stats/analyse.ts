/**
 * The analysis orchestrator: one call from rows of runs to everything the API, the command line and
 * the client show — ANOVA table, notes, descriptives, plot data, fitted values and residuals, and
 * the requested assumption checks and post-hoc tests (AnalysisResult in types.ts).
 *
 * Route through the engine:
 * 1. analysis-input.ts codes the factors and reads the responses exactly (decimal offset removed);
 * 2. cell-stats.ts summarises the runs per cell (two-pass, shifted);
 * 3. the model: one factor -> one-way table with eta^2/omega^2 and the sentence; two factors with the
 *    default terms -> anova-two-way.ts (balanced closed form or least squares); anything else ->
 *    linear-model.ts. One run per cell: the highest-order interaction is not tested (note);
 * 4. descriptives.ts, plot-data.ts, analysis-tests.ts.
 */
import { prepareData, type AnalysisRow } from './analysis-input.js';
import { cellGroups, runTests } from './analysis-tests.js';
import { fSentence } from './anova-one-way.js';
import { twoWayAnova } from './anova-two-way.js';
import { buildCellTable, type CellTable } from './cell-stats.js';
import { describe } from './descriptives.js';
import { dispersionAnalysis, type DispersionGoal } from './dispersion.js';
import { StatsInputError } from './errors.js';
import { fitLinearModel, validateModelInput } from './linear-model.js';
import { fullFactorialTerms, parseTerms } from './model-terms.js';
import { plotData } from './plot-data.js';
import { tukeyByTerm } from './tukey-by-term.js';
import type { AnalysisResult, AnovaEffectRow, LinearModelResult, OneWaySummary, SsType, TestName } from './types.js';

/** Version of the numerical engine, stored with every saved analysis so results can be traced. */
export const ENGINE_VERSION = '1.0.0';

export interface AnalysisRequest {
  rows: ReadonlyArray<AnalysisRow>;
  /** name of the response (for labels) */
  response: string;
  /** factors in model order (may be empty: then only the residual row and shapiro) */
  factors: string[];
  /** terms such as `A`, `A:B`; default: all main effects and interactions of `factors` */
  terms?: string[];
  /** default 2 */
  ssType?: SsType;
  /** significance level for notes and Tukey's confidence level (1 - alpha); default 0.05 */
  alpha?: number;
  tests?: ReadonlyArray<TestName | string>;
  /** level order per factor; default: order of first appearance */
  levels?: Record<string, string[]>;
  /**
   * run the dispersion analysis (per-cell ln s^2, CV, signal-to-noise, ranking) towards this goal;
   * needs at least one factor. It works on the responses in their own units (S/N ratios and the
   * target are not shift-invariant), so the offset is added back first.
   */
  dispersion?: DispersionGoal;
}

const CAUTIONS = [
  'Statistics inform engineering judgement; they do not replace it, the applicable test standards, or local codes and licensed practice.',
  'p-values assume independent runs (randomised run order), roughly normal residuals and equal variances across cells; check the residuals and the variance tests.',
];

function interceptOnly(table: CellTable, y: Float64Array): LinearModelResult {
  const df = table.n - 1;
  if (df < 1) throw new StatsInputError(`zero residual degrees of freedom: ${table.n} run(s) and no factor`, df);
  const mean = table.shift + table.grandMean;
  const residuals = y.map((v) => v - table.shift - table.grandMean);
  return {
    ssType: 2, terms: [], omitted: [], notes: [], residualDf: df,
    anova: [{ source: 'Residual', df, ss: table.totalSs, ms: table.totalSs / df }],
    mse: table.totalSs / df, residualSd: Math.sqrt(table.totalSs / df), rSquared: 0, rank: 1, columns: 1,
    balanced: true, fitted: new Float64Array(table.n).fill(mean), residuals,
  };
}

/** Whether the exact decimal reading mattered: the offset dwarfs the spread (>= 3 shared digits). */
function sharesLeadingDigits(y: Float64Array, offset: number): boolean {
  let min = Infinity;
  let max = -Infinity;
  for (const v of y) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return max > min && Math.abs(offset) >= 1e3 * (max - min);
}

function oneWaySummary(model: LinearModelResult, totalSs: number): OneWaySummary {
  const effect = model.anova[0] as AnovaEffectRow;
  const etaSq = effect.ss / totalSs;
  const omegaSq = (effect.ss - effect.df * model.mse) / (totalSs + model.mse);
  return { etaSq, omegaSq, sentence: fSentence(effect.f, effect.df, model.residualDf, effect.p) };
}

/**
 * Analyse a factorial data set.
 * @param request rows, response name, factors, terms, SS type, alpha, tests, level order
 * @returns the full typed result (see AnalysisResult in types.ts)
 * @throws StatsInputError naming the offending value for bad input: no rows, a factor named twice,
 *   fewer than two levels, a level with no data, a non-numeric/NaN/Infinite response, unknown terms
 *   or tests, zero residual df, alpha outside (0, 1)
 * @example analyse({ rows, response: 'breaks', factors: ['wool', 'tension'], tests: ['tukey'] })
 */
export function analyse(request: AnalysisRequest): AnalysisResult {
  const alpha = request.alpha ?? 0.05;
  if (!(alpha > 0 && alpha < 1)) throw new StatsInputError(`alpha must be between 0 and 1, got ${alpha}`, alpha);
  const ssType: SsType = request.ssType ?? 2;
  if (![1, 2, 3].includes(ssType)) throw new StatsInputError(`SS type must be 1, 2 or 3, got ${String(ssType)}`, ssType);
  const data = prepareData(request.rows, request.factors, request.levels);
  validateModelInput(data.y, data.factors);
  const table = buildCellTable(data.y, data.factors);
  const names = data.factors.map((f) => f.name);
  const notes: string[] = [];
  let terms = parseTerms(request.terms ?? fullFactorialTerms(names), names).map((t) => t.name);
  if (sharesLeadingDigits(data.y, data.offset)) {
    notes.push(`responses were read as exact decimals relative to ${data.offsetText} (the ANOVA does not depend on a common shift)`);
  }
  const top = names.join(':');
  if (names.length > 1 && table.cellN.every((n) => n === 1) && terms.includes(top)) {
    terms = terms.filter((t) => t !== top);
    notes.push(`only one run per cell: no degrees of freedom are left to test ${top}, so it is not fitted and any such interaction is part of the residual`);
  }
  let model: LinearModelResult;
  if (names.length === 0) model = interceptOnly(table, data.y);
  else if (names.length === 2 && [`${names[0]},${names[1]},${top}`, `${names[0]},${names[1]}`].includes(terms.join(','))) {
    model = twoWayAnova({ y: data.y, a: data.factors[0], b: data.factors[1], ssType, interaction: terms.length === 3 }, table);
  } else model = fitLinearModel({ y: data.y, factors: data.factors, terms, ssType }, table);
  notes.push(...model.notes);
  const oneWay = names.length === 1 && model.terms.length === 1 ? oneWaySummary(model, table.totalSs) : undefined;
  const tested = runTests(request.tests ?? [], table, data.y, model.residuals, alpha);
  notes.push(...tested.notes);
  // Post-hoc per fitted term with the model's error term (R's TukeyHSD(aov) convention); a term
  // whose groups cannot be compared (e.g. one run in a group and no model df) is noted, not fatal.
  let posthoc;
  if ((request.tests ?? []).includes('tukey') && model.terms.length > 0 && model.residualDf > 0) {
    try {
      posthoc = tukeyByTerm(data.y, data.factors, model.terms, model.mse, model.residualDf, 1 - alpha);
    } catch (err) {
      // Expected failure: tukeyHsd's input checks on a degenerate term (StatsInputError).
      if (!(err instanceof StatsInputError)) throw err;
      notes.push(`Tukey per model term not run: ${err.message}`);
    }
  }
  let dispersion;
  if (request.dispersion) {
    if (names.length === 0) throw new StatsInputError('the dispersion analysis compares cells and needs at least one factor', 'dispersion');
    const cells = cellGroups(table, data.y).map((g) => ({
      key: g.levels,
      values: g.values.map((v) => v + data.offset),
    }));
    dispersion = dispersionAnalysis(cells, names, request.dispersion);
  }
  return {
    engineVersion: ENGINE_VERSION,
    response: request.response,
    factors: names,
    terms: model.terms,
    ssType,
    anova: model.anova,
    omitted: model.omitted,
    notes,
    cautions: CAUTIONS,
    model: {
      residualDf: model.residualDf,
      mse: model.mse,
      residualSd: model.residualSd,
      rSquared: model.rSquared,
      rank: model.rank,
      balanced: model.balanced,
    },
    oneWay,
    descriptives: describe(table, data.offset),
    plots: plotData(table, data.offset),
    fitted: Array.from(model.fitted, (v) => v + data.offset),
    residuals: Array.from(model.residuals),
    tests: tested.tests,
    posthoc,
    dispersion,
    responseOffset: data.offsetText,
  };
}
