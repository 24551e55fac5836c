/**
 * Chart-ready data for main-effect and interaction plots: per level (and per pair-of-factors cell)
 * means with 95 % confidence intervals, in level order.
 *
 * Each point's CI uses that point's own runs (mean +- t SD / sqrt(n)), so it shows how well the point
 * itself is known; it is not a simultaneous or post-hoc interval, and overlapping bars are not a
 * test (use the ANOVA and Tukey HSD for that).
 */
import type { CellTable } from './cell-stats.js';
import { describeSubset } from './descriptives.js';
import type { InteractionPlot, MainEffectPlot, PlotData, PlotPoint } from './types.js';

/**
 * Main-effect plots for every factor and interaction plots for every pair of factors
 * (x axis: the earlier factor in model order; lines: the later one).
 * @param table cell summaries
 * @param offset decimal offset removed from the responses (added back here)
 */
export function plotData(table: CellTable, offset: number, confLevel = 0.95): PlotData {
  const location = offset + table.shift;
  const mainEffects: MainEffectPlot[] = table.factors.map((f, i) => ({
    factor: f.name,
    points: describeSubset(table, [i], location, confLevel).map(
      (g): PlotPoint => ({ x: g.levels[f.name], n: g.n, mean: g.mean, lower: g.ciLower, upper: g.ciUpper }),
    ),
  }));
  const interactions: InteractionPlot[] = [];
  for (let i = 0; i < table.factors.length; i++) {
    for (let j = i + 1; j < table.factors.length; j++) {
      const xf = table.factors[i].name;
      const sf = table.factors[j].name;
      interactions.push({
        xFactor: xf,
        seriesFactor: sf,
        points: describeSubset(table, [i, j], location, confLevel).map(
          (g): PlotPoint => ({ x: g.levels[xf], series: g.levels[sf], n: g.n, mean: g.mean, lower: g.ciLower, upper: g.ciUpper }),
        ),
      });
    }
  }
  return { grandMean: location + table.grandMean, mainEffects, interactions };
}
