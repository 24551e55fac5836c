import type { EChartsOption, LineSeriesOption, SeriesOption } from 'echarts';
import type { InteractionPlot, MainEffectPlot, PlotPoint } from '../../stats/types.js';
import { axisStyle, baseOption, DASHES, errorBarSeries, fmt, SHAPES, seriesColour, type ChartTheme, type ErrorBarDatum } from './theme.js';

/**
 * Main-effect and interaction plots: level means with the 95 % CI of each point. Levels sit on a
 * numeric axis at 0, 1, 2, … (labelled with the level names) so that the lines of an interaction plot
 * can be dodged sideways and their CI bars do not hide each other.
 */

function tooltipText(factorLabel: string, p: PlotPoint, seriesLabel?: string): string {
  const ci = p.lower === null ? 'CI n/a (one run)' : `95% CI ${fmt(p.lower)} to ${fmt(p.upper)}`;
  return `${factorLabel} = ${p.x}${seriesLabel && p.series !== undefined ? `, ${seriesLabel} = ${p.series}` : ''}<br/>n = ${p.n}, mean = ${fmt(p.mean)}<br/>${ci}`;
}

function levelAxis(theme: ChartTheme, name: string, levels: string[]) {
  const base = axisStyle(theme, name);
  const at = levels.map((_, i) => i);
  return {
    type: 'value' as const,
    ...base,
    min: -0.5,
    max: levels.length - 0.5,
    splitLine: { show: false },
    // Ticks and labels only at the level positions 0, 1, 2, …; the half steps are padding.
    axisTick: { ...base.axisTick, customValues: at },
    axisLabel: { ...base.axisLabel, customValues: at, formatter: (v: number) => levels[Math.round(v)] ?? '' },
  };
}

export function mainEffectOption(plot: MainEffectPlot, opts: { theme: ChartTheme; response: string; grandMean: number; caption: string }): EChartsOption {
  const { theme } = opts;
  const levels = plot.points.map((p) => p.x);
  const colour = seriesColour(0, theme);
  const bars: ErrorBarDatum[] = plot.points.filter((p) => p.lower !== null).map((p) => [levels.indexOf(p.x), p.lower!, p.upper!]);
  const means: LineSeriesOption = {
    type: 'line',
    name: 'mean',
    data: plot.points.map((p, i) => ({ value: [i, p.mean], tooltipText: tooltipText(plot.factor, p) })),
    symbol: 'circle',
    symbolSize: 9,
    lineStyle: { color: colour, width: 2 },
    itemStyle: { color: colour },
    z: 3,
    markLine: {
      silent: true,
      symbol: 'none',
      label: { formatter: `grand mean ${fmt(opts.grandMean)}`, color: theme.muted, fontSize: 10, position: 'insideEndTop' },
      lineStyle: { color: theme.reference, type: [3, 3], width: 1 },
      data: [{ yAxis: opts.grandMean }],
    },
  };
  return {
    ...baseOption(theme, `Main effect of ${plot.factor}`, opts.caption),
    tooltip: { trigger: 'item', confine: true, formatter: (p) => String((p as { data?: { tooltipText?: string } }).data?.tooltipText ?? '') },
    xAxis: levelAxis(theme, plot.factor, levels),
    yAxis: { type: 'value', scale: true, ...axisStyle(theme, `mean ${opts.response}`), nameGap: 48 },
    series: [errorBarSeries('95% CI', bars, colour), means],
  };
}

/** Swaps the roles of the two factors (the "mirror" view of the same cell means). */
export function mirrorInteraction(plot: InteractionPlot): InteractionPlot {
  return {
    xFactor: plot.seriesFactor,
    seriesFactor: plot.xFactor,
    points: plot.points.map((p) => ({ ...p, x: p.series ?? '', series: p.x })),
  };
}

function orderedUnique(values: string[]): string[] {
  return [...new Set(values)];
}

export function interactionOption(plot: InteractionPlot, opts: { theme: ChartTheme; response: string; caption: string; xLevels?: string[]; seriesLevels?: string[] }): EChartsOption {
  const { theme } = opts;
  const xLevels = opts.xLevels ?? orderedUnique(plot.points.map((p) => p.x));
  const sLevels = opts.seriesLevels ?? orderedUnique(plot.points.map((p) => p.series ?? ''));
  const width = Math.min(0.3, 0.12 * (sLevels.length - 1));
  const series: SeriesOption[] = [];
  sLevels.forEach((level, si) => {
    const colour = seriesColour(si, theme);
    const dodge = sLevels.length > 1 ? -width / 2 + (width * si) / (sLevels.length - 1) : 0;
    const pts = xLevels.map((x) => plot.points.find((p) => p.x === x && p.series === level)).filter((p): p is PlotPoint => p !== undefined);
    const bars: ErrorBarDatum[] = pts.filter((p) => p.lower !== null).map((p) => [xLevels.indexOf(p.x) + dodge, p.lower!, p.upper!]);
    series.push(errorBarSeries(`${level} CI`, bars, colour, 4));
    series.push({
      type: 'line',
      name: `${plot.seriesFactor} = ${level}`,
      data: pts.map((p) => ({ value: [xLevels.indexOf(p.x) + dodge, p.mean], tooltipText: tooltipText(plot.xFactor, p, plot.seriesFactor) })),
      symbol: SHAPES[si % SHAPES.length],
      symbolSize: 9,
      lineStyle: { color: colour, width: 2, type: DASHES[si % DASHES.length] },
      itemStyle: { color: colour },
      z: 3,
    });
  });
  return {
    ...baseOption(theme, `${plot.xFactor} x ${plot.seriesFactor} interaction`, opts.caption),
    tooltip: { trigger: 'item', confine: true, formatter: (p) => String((p as { data?: { tooltipText?: string } }).data?.tooltipText ?? '') },
    legend: { top: 40, right: 16, textStyle: { color: theme.text, fontSize: 11, fontFamily: theme.fontFamily }, data: sLevels.map((l) => `${plot.seriesFactor} = ${l}`) },
    grid: { left: 64, right: 24, top: 76, bottom: 56 },
    xAxis: levelAxis(theme, plot.xFactor, xLevels),
    yAxis: { type: 'value', scale: true, ...axisStyle(theme, `mean ${opts.response}`), nameGap: 48 },
    series,
  };
}
