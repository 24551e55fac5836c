/**
 * Result types of the analysis engine, shared by the API, the command line and the Angular client.
 *
 * Conventions that hold for every type here:
 * - Numbers that cannot be computed (an SD from one run, F of the residual row) are `null`, never
 *   NaN, so that JSON carries them faithfully.
 * - Interaction sources are written with a colon, factor names in model order: `A:B`, `A:B:C`.
 * - p-values are upper-tail probabilities computed directly (see distributions.ts); a p below 1e-16 is
 *   still returned as the number, and `formatP` turns it into "p < 1e-16" for display.
 */

import type { DispersionResult } from './dispersion.js';

/** Which sums of squares an ANOVA table reports. */
export type SsType = 1 | 2 | 3;

/** One effect row of an ANOVA table. */
export interface AnovaEffectRow {
  /** term name: a factor (`A`) or an interaction (`A:B`) */
  source: string;
  df: number;
  ss: number;
  ms: number;
  f: number;
  p: number;
  /** SS / (SS + SS_residual) */
  partialEtaSq: number;
}

/** The residual (error) row of an ANOVA table. */
export interface AnovaResidualRow {
  source: 'Residual';
  df: number;
  ss: number;
  ms: number;
}

export type AnovaRow = AnovaEffectRow | AnovaResidualRow;

/** A term the user asked for that the data cannot estimate (e.g. completely aliased, or no df left). */
export interface OmittedTerm {
  source: string;
  /** why no numbers are shown, in words */
  reason: string;
}

/** Summary statistics of one group of runs (a factor level or a cell). */
export interface GroupDescriptives {
  /** factor -> level for the factors that define the group */
  levels: Record<string, string>;
  /** display label: levels joined with ':' in factor order, e.g. `A:L` */
  label: string;
  n: number;
  mean: number;
  /** sample SD (denominator n - 1); null when n < 2 */
  sd: number | null;
  variance: number | null;
  /** coefficient of variation SD / |mean|; null when undefined (n < 2 or mean 0) */
  cv: number | null;
  min: number;
  max: number;
  /** 95 % confidence interval of the mean from the group's own SD and t(n - 1); null when n < 2 */
  ciLower: number | null;
  ciUpper: number | null;
}

/** Descriptives per level of each factor and per cell (combination of all factors). */
export interface DescriptivesResult {
  overall: GroupDescriptives;
  /** factor name -> one entry per level, in level order */
  byLevel: Record<string, GroupDescriptives[]>;
  /** one entry per observed cell, in standard order (first factor varies fastest) */
  byCell: GroupDescriptives[];
  /** cells of the full crossing that hold no runs, as labels (`A:H`) */
  emptyCells: string[];
  /** confidence level used for ciLower/ciUpper */
  confLevel: number;
}

/** One point of a main-effect or interaction chart. */
export interface PlotPoint {
  /** level on the x axis */
  x: string;
  /** series level (interaction charts), absent for main-effect charts */
  series?: string;
  n: number;
  mean: number;
  /** 95 % CI of the mean from the point's own runs; null when n < 2 */
  lower: number | null;
  upper: number | null;
}

export interface MainEffectPlot {
  factor: string;
  points: PlotPoint[];
}

export interface InteractionPlot {
  /** factor on the x axis */
  xFactor: string;
  /** factor whose levels form the lines */
  seriesFactor: string;
  points: PlotPoint[];
}

export interface PlotData {
  grandMean: number;
  mainEffects: MainEffectPlot[];
  interactions: InteractionPlot[];
}

/** One-way ANOVA extras: effect sizes and the plain-language sentence. */
export interface OneWaySummary {
  /** SS_between / SS_total */
  etaSq: number;
  /** (SS_between - df_between MS_within) / (SS_total + MS_within) */
  omegaSq: number;
  /** e.g. "F(2, 51) = 7.21, p = 0.00175" */
  sentence: string;
}

/** A one-way ANOVA: the table (effect row, residual row) plus effect sizes and the sentence. */
export interface OneWayAnovaResult extends OneWaySummary {
  /** name of the grouping factor as shown in the table */
  source: string;
  effect: AnovaEffectRow;
  residual: AnovaResidualRow;
  /** total corrected sum of squares */
  totalSs: number;
}

/** A fitted linear model (any number of factors) with its ANOVA table. */
export interface LinearModelResult {
  ssType: SsType;
  /** terms fitted, in model order, after dropping the omitted ones */
  terms: string[];
  /** effect rows in model order, then the residual row */
  anova: AnovaRow[];
  omitted: OmittedTerm[];
  /** messages about the fit (aliasing, empty cells, coding, cautions) */
  notes: string[];
  /** N - rank */
  residualDf: number;
  /** residual mean square */
  mse: number;
  /** sqrt(MSE) */
  residualSd: number;
  rSquared: number;
  /** rank of the model matrix (intercept included) */
  rank: number;
  /** number of model-matrix columns before aliased ones were dropped (intercept included) */
  columns: number;
  /** whether every cell of the full crossing has the same number of runs */
  balanced: boolean;
  /** fitted value of every run, in input order */
  fitted: Float64Array;
  /** residual (observed - fitted) of every run, in input order */
  residuals: Float64Array;
}

/** An F test (Welch, Levene, Brown–Forsythe). */
export interface FTestResult {
  f: number;
  df1: number;
  df2: number;
  p: number;
}

/** A chi-square test (Bartlett, Kruskal–Wallis). */
export interface ChiSquareResult {
  statistic: number;
  df: number;
  p: number;
}

/** Shapiro–Wilk W and its p-value. */
export interface NormalityResult {
  w: number;
  p: number;
}

/** One Tukey HSD comparison; diff = mean(b) - mean(a), with simultaneous CI and adjusted p. */
export interface TukeyComparison {
  a: string;
  b: string;
  diff: number;
  lower: number;
  upper: number;
  p: number;
}

/** The optional tests of an analysis; present only when asked for. */
export type TestName = 'tukey' | 'welch' | 'levene' | 'brown-forsythe' | 'bartlett' | 'kruskal' | 'shapiro';

/**
 * Results of the requested tests. One-factor tests (all but shapiro) compare the cells of the
 * analysed factors (each combination of levels is one group); shapiro tests the model's residuals.
 */
export interface AnalysisTests {
  tukey?: TukeyComparison[];
  welch?: FTestResult;
  levene?: FTestResult;
  brownForsythe?: FTestResult;
  bartlett?: ChiSquareResult;
  kruskal?: ChiSquareResult;
  shapiro?: NormalityResult;
}

/** Everything one analysis returns (see analyse.ts). */
export interface AnalysisResult {
  engineVersion: string;
  response: string;
  factors: string[];
  /** the terms fitted, after dropping omitted ones */
  terms: string[];
  ssType: SsType;
  /** effect rows in model order, then the residual row */
  anova: AnovaRow[];
  /** requested terms without a row, and why */
  omitted: OmittedTerm[];
  /** messages about the fit, the data and the tests, in the order they arose */
  notes: string[];
  /** always-present reminders on how far the numbers go */
  cautions: string[];
  model: {
    residualDf: number;
    mse: number;
    residualSd: number;
    rSquared: number;
    rank: number;
    balanced: boolean;
  };
  /** present when exactly one factor is analysed */
  oneWay?: OneWaySummary;
  descriptives: DescriptivesResult;
  plots: PlotData;
  /** fitted value per input row, in input order */
  fitted: number[];
  /** residual per input row, in input order */
  residuals: number[];
  tests: AnalysisTests;
  /**
   * Tukey HSD per fitted term with the model's residual MS and df (R's TukeyHSD on the model),
   * present when 'tukey' was asked for. `tests.tukey` instead compares all cells with their own
   * pooled variance (the command line's one-factor contract).
   */
  posthoc?: { term: string; comparisons: TukeyComparison[] }[];
  /** dispersion analysis over the cells (dispersion.ts), when a goal was given */
  dispersion?: DispersionResult;
  /** the decimal offset subtracted from the responses before the analysis (see decimal-input.ts) */
  responseOffset: string;
}
