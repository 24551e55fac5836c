/**
 * One-way ANOVA with eta squared, omega squared and a plain-language sentence.
 *
 * Closed form on the cell summaries: SS_between = sum n_i (mean_i - mean)^2, SS_within = sum of the
 * groups' centred sums of squares (two-pass, on values shifted by the first observation; see
 * cell-stats.ts). Effect sizes: eta^2 = SS_between / SS_total (share of the observed variation);
 * omega^2 = (SS_between - df_between MS_within) / (SS_total + MS_within), the less biased estimate
 * of the population share (Hays), which can come out negative for small effects.
 *
 * Caution: F assumes independent runs, roughly normal errors and equal variances; check residuals
 * and the variance tests before leaning on the p-value.
 */
import { buildCellTable, type CodedFactor } from './cell-stats.js';
import { readResponses } from './decimal-input.js';
import { formatP, fUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';
import type { OneWayAnovaResult } from './types.js';

/** A group of runs with its label (a factor level). */
export interface LabelledGroup {
  label: string;
  values: ArrayLike<number> | ReadonlyArray<string>;
}

/** A group given as values (numbers or decimal strings) or as {label, values}. */
export type GroupInput = ReadonlyArray<number | string> | LabelledGroup;

function toLabelled(groups: ReadonlyArray<GroupInput>): { label: string; values: ReadonlyArray<number | string> }[] {
  return groups.map((g, i) =>
    'label' in g && 'values' in g
      ? { label: g.label, values: Array.from(g.values as ArrayLike<number | string>) }
      : { label: `group ${i + 1}`, values: g as ReadonlyArray<number | string> },
  );
}

/** Format a statistic with four significant digits for the sentence (plain, no exponent below 1e6). */
function fmt(x: number): string {
  return Math.abs(x) >= 1e6 || (Math.abs(x) < 1e-3 && x !== 0) ? x.toExponential(3) : String(Number(x.toPrecision(4)));
}

/** "F(2, 51) = 7.206, p = 0.00175" */
export function fSentence(f: number, df1: number, df2: number, p: number): string {
  return `F(${fmt(df1)}, ${fmt(df2)}) = ${fmt(f)}, ${formatP(p)}`;
}

/**
 * One-way ANOVA of k groups. Values may be numbers or decimal strings; both go through
 * readResponses (decimal-input.ts), which reads strings exactly and re-reads numbers with many shared
 * leading digits as their decimals, so NIST StRD SmLs04-09 keep their digits.
 * @param groups arrays of values, or {label, values}; at least two groups, each non-empty
 * @param source name of the factor for the table row (default "group")
 * @returns the effect and residual rows, eta^2, omega^2 and the sentence
 * @throws StatsInputError for fewer than two groups, an empty group, NaN/Infinity/non-numbers, or no residual df
 * @example oneWayAnova([[1, 2, 3], [4, 5, 6]]).sentence // "F(1, 4) = 13.5, p = 0.0213"
 */
export function oneWayAnova(groups: ReadonlyArray<GroupInput>, source = 'group'): OneWayAnovaResult {
  const labelled = toLabelled(groups);
  if (labelled.length < 2) throw new StatsInputError(`one-way ANOVA needs at least two groups, got ${labelled.length}`, labelled.length);
  const empty = labelled.find((g) => g.values.length === 0);
  if (empty) throw new StatsInputError(`group '${empty.label}' has no data`, empty.label);
  const flat = labelled.flatMap((g) => g.values);
  const where = labelled.flatMap((g) => g.values.map((_, j) => `group '${g.label}', value ${j + 1}`));
  const { shifted: y } = readResponses(flat, (i) => where[i]);
  const codes = Int32Array.from(labelled.flatMap((g, gi) => g.values.map(() => gi)));
  const factor: CodedFactor = { name: source, levels: labelled.map((g) => g.label), codes };
  const table = buildCellTable(y, [factor]);
  let between = 0;
  let within = 0;
  for (let c = 0; c < table.cellCount; c++) {
    between += table.cellN[c] * (table.cellMean[c] - table.grandMean) ** 2;
    within += table.cellSs[c];
  }
  const total = y.length;
  const dfB = labelled.length - 1;
  const dfW = total - labelled.length;
  if (dfW < 1) throw new StatsInputError(`zero residual degrees of freedom: ${total} runs in ${labelled.length} groups`, dfW);
  if (!(within > 0)) throw new StatsInputError('no variation within the groups: F is undefined', within);
  const msB = between / dfB;
  const msW = within / dfW;
  const f = msB / msW;
  const p = fUpperTail(f, dfB, dfW);
  const totalSs = between + within;
  return {
    source,
    effect: { source, df: dfB, ss: between, ms: msB, f, p, partialEtaSq: between / totalSs },
    residual: { source: 'Residual', df: dfW, ss: within, ms: msW },
    totalSs,
    etaSq: between / totalSs,
    omegaSq: (between - dfB * msW) / (totalSs + msW),
    sentence: fSentence(f, dfB, dfW, p),
  };
}
