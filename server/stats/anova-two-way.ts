/**
 * Two-way ANOVA with interaction.
 *
 * Balanced data (every cell of the a x b crossing holds r runs): the closed form
 *   SS_A = b r sum_i (mean_i. - mean)^2, SS_B = a r sum_j (mean_.j - mean)^2,
 *   SS_AB = r sum_ij (mean_ij - mean_i. - mean_.j + mean)^2, SS_E = sum of within-cell SS,
 * for which Type I, II and III coincide. Unbalanced data, or empty cells: least squares through
 * linear-model.ts with the requested SS type.
 * One run per cell leaves no df to separate interaction from error: the interaction is then not
 * tested (the additive model is fitted) and a note says why.
 */
import { buildCellTable, isBalanced, type CellTable, type CodedFactor } from './cell-stats.js';
import { fUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';
import { fitLinearModel, validateModelInput } from './linear-model.js';
import type { AnovaEffectRow, LinearModelResult, SsType } from './types.js';

export interface TwoWayInput {
  y: ArrayLike<number>;
  a: CodedFactor;
  b: CodedFactor;
  /** default 2; irrelevant for balanced data */
  ssType?: SsType;
  /** fit and test A:B (default true) */
  interaction?: boolean;
}

/**
 * Two-way ANOVA of y on factors a and b.
 * @param precomputed a CellTable of the same y and [a, b], if the caller already has one
 * @returns the typed linear-model result (rows A, B, [A:B], Residual; notes; fitted; residuals)
 * @throws StatsInputError for bad factors/values (see validateModelInput) or no residual df
 * @example twoWayAnova({ y: breaks, a: wool, b: tension }).anova[2].source // "wool:tension"
 */
export function twoWayAnova(input: TwoWayInput, precomputed?: CellTable): LinearModelResult {
  const { y, a, b } = input;
  const ssType = input.ssType ?? 2;
  validateModelInput(y, [a, b]);
  const table = precomputed ?? buildCellTable(y, [a, b]);
  const notes: string[] = [];
  let interaction = input.interaction ?? true;
  const interactionName = `${a.name}:${b.name}`;
  const onePerCell = table.cellN.every((n) => n === 1);
  if (interaction && onePerCell) {
    interaction = false;
    notes.push(
      `only one run per cell: no degrees of freedom are left to test ${interactionName}, so the additive model ${a.name} + ${b.name} is fitted and any interaction is part of the residual`,
    );
  }
  if (isBalanced(table)) {
    const result = balancedClosedForm(y, table, interaction, ssType);
    result.notes.unshift(...notes);
    return result;
  }
  const terms = interaction ? [a.name, b.name, interactionName] : [a.name, b.name];
  const result = fitLinearModel({ y, factors: [a, b], terms, ssType }, table);
  result.notes.unshift(...notes);
  return result;
}

function balancedClosedForm(y: ArrayLike<number>, table: CellTable, interaction: boolean, ssType: SsType): LinearModelResult {
  const [fa, fb] = table.factors;
  const I = fa.levels.length;
  const J = fb.levels.length;
  const r = table.cellN[0];
  const g = table.grandMean;
  const m = new Float64Array(I * J); // cell means of d, centred on the grand mean
  for (let c = 0; c < table.cellCount; c++) m[table.cellLevels[0][c] + I * table.cellLevels[1][c]] = table.cellMean[c] - g;
  const rowMean = new Float64Array(I);
  const colMean = new Float64Array(J);
  for (let i = 0; i < I; i++) for (let j = 0; j < J; j++) {
    rowMean[i] += m[i + I * j] / J;
    colMean[j] += m[i + I * j] / I;
  }
  let ssA = 0;
  let ssB = 0;
  let ssAB = 0;
  for (let i = 0; i < I; i++) ssA += rowMean[i] ** 2;
  for (let j = 0; j < J; j++) ssB += colMean[j] ** 2;
  for (let i = 0; i < I; i++) for (let j = 0; j < J; j++) ssAB += (m[i + I * j] - rowMean[i] - colMean[j]) ** 2;
  ssA *= J * r;
  ssB *= I * r;
  ssAB *= r;
  let within = 0;
  for (let c = 0; c < table.cellCount; c++) within += table.cellSs[c];
  const dfA = I - 1;
  const dfB = J - 1;
  const dfAB = dfA * dfB;
  const rss = interaction ? within : within + ssAB;
  const residualDf = table.n - 1 - dfA - dfB - (interaction ? dfAB : 0);
  if (residualDf < 1) throw new StatsInputError(`zero residual degrees of freedom: ${table.n} runs in ${I} x ${J} cells`, residualDf);
  if (!(rss > 0)) throw new StatsInputError('the residual sum of squares is 0 (every run equals its fitted value): F tests are undefined', rss);
  const mse = rss / residualDf;
  const row = (source: string, ss: number, df: number): AnovaEffectRow => {
    const f = ss / df / mse;
    return { source, df, ss, ms: ss / df, f, p: fUpperTail(f, df, residualDf), partialEtaSq: ss / (ss + rss) };
  };
  const rows = [row(fa.name, ssA, dfA), row(fb.name, ssB, dfB)];
  if (interaction) rows.push(row(`${fa.name}:${fb.name}`, ssAB, dfAB));
  const fitted = new Float64Array(table.n);
  const residuals = new Float64Array(table.n);
  const base = table.shift + g;
  const cellFit = new Float64Array(table.cellCount);
  for (let c = 0; c < table.cellCount; c++) {
    const i = table.cellLevels[0][c];
    const j = table.cellLevels[1][c];
    cellFit[c] = interaction ? m[i + I * j] : rowMean[i] + colMean[j];
  }
  for (let k = 0; k < table.n; k++) {
    const c = table.cellOfRun[k];
    fitted[k] = base + cellFit[c];
    residuals[k] = y[k] - table.shift - g - cellFit[c];
  }
  return {
    ssType,
    terms: rows.map((x) => x.source),
    anova: [...rows, { source: 'Residual', df: residualDf, ss: rss, ms: mse }],
    omitted: [],
    notes: ['balanced design: closed-form sums of squares; Type I, II and III coincide'],
    residualDf,
    mse,
    residualSd: Math.sqrt(mse),
    rSquared: table.totalSs > 0 ? 1 - rss / table.totalSs : 0,
    rank: table.n - residualDf,
    columns: table.n - residualDf,
    balanced: true,
    fitted,
    residuals,
  };
}
