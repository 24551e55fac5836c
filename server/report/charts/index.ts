import type { EChartsOption } from 'echarts';
import type { AnalysisResult, AnovaEffectRow } from '../../stats/types.js';
import { dispersionOption } from './dispersion-plot.js';
import { boxPlotOption, type LevelValues } from './distribution-plots.js';
import { interactionOption, mainEffectOption, mirrorInteraction } from './effect-plots.js';
import { qqOption, residualsOption } from './residual-plots.js';
import { chartTheme, fCaption, fmt, type ChartMode } from './theme.js';

/**
 * Every chart of an analysis, as echarts options: the server renders them to SVG for the report and
 * the client can feed the same builders to ngx-echarts (register LineChart, ScatterChart, BarChart,
 * BoxplotChart, CustomChart, Grid, Title, Legend, Tooltip, MarkLine and the SVG or canvas renderer).
 * Chart ids double as comment anchors: "chart:<id>".
 */

export interface ChartSpec {
  id: string;
  title: string;
  caption: string;
  option: EChartsOption;
}

export interface ChartInput {
  result: AnalysisResult;
  /** model terms as chosen (interaction plots are drawn for the chosen pairs) */
  terms: string[];
  /** per run used: factor settings and the value as entered, in engine input order */
  runs: { settings: Record<string, string>; value: string; code: string }[];
  /** level order per factor */
  levels: Record<string, string[]>;
  mode?: ChartMode;
}

function effectRow(result: AnalysisResult, source: string): AnovaEffectRow | undefined {
  return result.anova.find((r): r is AnovaEffectRow => r.source === source);
}

export function buildCharts(input: ChartInput): ChartSpec[] {
  const { result } = input;
  const theme = chartTheme(input.mode);
  const response = result.response;
  const df = result.model.residualDf;
  const charts: ChartSpec[] = [];
  for (const plot of result.plots.mainEffects) {
    const caption = `${fCaption(effectRow(result, plot.factor), df)}; bars: 95% CI of each level mean`;
    charts.push({ id: `main-effects:${plot.factor}`, title: `Main effect of ${plot.factor}`, caption, option: mainEffectOption(plot, { theme, response, grandMean: result.plots.grandMean, caption }) });
  }
  const pairs = new Set(input.terms.filter((t) => t.split(':').length === 2).map((t) => t.split(':').sort().join(':')));
  for (const plot of result.plots.interactions) {
    if (!pairs.has([plot.xFactor, plot.seriesFactor].sort().join(':'))) continue;
    const row = effectRow(result, `${plot.xFactor}:${plot.seriesFactor}`) ?? effectRow(result, `${plot.seriesFactor}:${plot.xFactor}`);
    const caption = `${plot.xFactor}:${plot.seriesFactor} ${fCaption(row, df)}; bars: 95% CI of each cell mean`;
    const mirror = mirrorInteraction(plot);
    charts.push({
      id: `interaction:${plot.xFactor}:${plot.seriesFactor}`,
      title: `${plot.xFactor} x ${plot.seriesFactor} interaction`,
      caption,
      option: interactionOption(plot, { theme, response, caption, xLevels: input.levels[plot.xFactor], seriesLevels: input.levels[plot.seriesFactor] }),
    });
    charts.push({
      id: `interaction:${mirror.xFactor}:${mirror.seriesFactor}`,
      title: `${mirror.xFactor} x ${mirror.seriesFactor} interaction (mirror)`,
      caption,
      option: interactionOption(mirror, { theme, response, caption, xLevels: input.levels[mirror.xFactor], seriesLevels: input.levels[mirror.seriesFactor] }),
    });
  }
  for (const factor of result.factors) {
    const levels = input.levels[factor] ?? [...new Set(input.runs.map((r) => r.settings[factor]!))];
    const groups: LevelValues[] = levels.map((level) => ({ level, values: input.runs.filter((r) => r.settings[factor] === level).map((r) => Number(r.value)) }));
    charts.push({ id: `box:${factor}`, title: `${response} by ${factor}`, caption: 'box: quartiles; whiskers: 1.5 IQR; diamond: mean', option: boxPlotOption(factor, groups, { theme, response, caption: 'box: quartiles; whiskers: 1.5 IQR; diamond: mean' }) });
  }
  const codes = input.runs.map((r) => r.code);
  const resCaption = `residual SD ${fmt(result.model.residualSd)}; look for funnels and curves`;
  charts.push({ id: 'residuals', title: 'Residuals vs fitted', caption: resCaption, option: residualsOption(result.fitted, result.residuals, codes, { theme, response, caption: resCaption }) });
  const sw = result.tests.shapiro;
  const qqCaption = sw ? `Shapiro-Wilk W = ${fmt(sw.w)}, p = ${fmt(sw.p)}` : 'points near the line: residuals close to normal';
  charts.push({ id: 'qq', title: 'Normal Q-Q plot of residuals', caption: qqCaption, option: qqOption(result.residuals, codes, { theme, caption: qqCaption }) });
  const lv = result.tests.levene;
  const dispCaption = lv ? `Levene over the cells F = ${fmt(lv.f)}, p = ${fmt(lv.p)}` : 'SD per setting';
  charts.push({ id: 'dispersion', title: `Scatter of ${response} per setting`, caption: dispCaption, option: dispersionOption(result.descriptives.byCell, { theme, response, caption: dispCaption }) });
  return charts;
}
