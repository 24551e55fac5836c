import type { CustomSeriesOption, LineSeriesOption } from 'echarts/charts';
import type { GridComponentOption } from 'echarts/components';
import type { XAXisComponentOption } from 'echarts';
import type { TooltipComponentFormatterCallbackParams } from 'echarts';
import type { PlotPoint } from '../../../shared/analysis';
import { type ChartTheme, seriesColor, seriesDash, seriesSymbol } from './chart-theme';
import {
  type ChartOption,
  baseText,
  ciCapsule,
  ciTooltipLine,
  esc,
  legendStyle,
  levelAxisStyle,
  paddedExtent,
  sharedValueAxes,
  tooltipStyle,
  valueAxisStyle,
} from './chart-kit';
import { formatNumber } from './format';

export interface MainEffectInput {
  factor: string;
  /** axis title, e.g. "Neck width ratio (W)" */
  label: string;
  points: PlotPoint[];
}

export interface InteractionInput {
  xFactor: string;
  seriesFactor: string;
  xLabel: string;
  seriesLabel: string;
  points: PlotPoint[];
}

/** The same interaction seen the other way round: the line factor goes on the axis and vice versa. */
export function mirrored(input: InteractionInput): InteractionInput {
  return {
    xFactor: input.seriesFactor,
    seriesFactor: input.xFactor,
    xLabel: input.seriesLabel,
    seriesLabel: input.xLabel,
    points: input.points.map((p) => ({ ...p, x: p.series ?? '', series: p.x })),
  };
}

function firstSeen(values: readonly string[]): string[] {
  return [...new Set(values)];
}

function pointTooltip(title: string, p: PlotPoint): string {
  return `<b>${esc(title)}</b><br/>n = ${p.n}<br/>mean = ${formatNumber(p.mean)}<br/>${ciTooltipLine(p.lower, p.upper)}`;
}

function single(params: TooltipComponentFormatterCallbackParams) {
  return Array.isArray(params) ? params[0] : params;
}

/**
 * Main effects as small multiples: one panel per factor side by side on one shared response scale, so
 * the steepest profile is the largest effect at a glance. The overall mean runs through every panel as a
 * dashed reference; each level mean carries its 95 % CI capsule.
 */
export function mainEffectsOption(effects: readonly MainEffectInput[], grandMean: number, responseLabel: string, theme: ChartTheme): ChartOption {
  const k = Math.max(effects.length, 1);
  const span = 88 / k;
  const extent = paddedExtent([grandMean, ...effects.flatMap((e) => e.points.flatMap((p) => [p.mean, p.lower, p.upper]))]);
  const grid: GridComponentOption[] = effects.map((_, i) => ({ left: `${9 + i * span}%`, width: `${span - 3}%`, top: 24, bottom: 48 }));
  const xAxis: XAXisComponentOption[] = effects.map((e, i) => ({
    type: 'category',
    gridIndex: i,
    name: e.label,
    data: e.points.map((p) => p.x),
    boundaryGap: true,
    ...levelAxisStyle(theme),
  }));
  const yAxis = sharedValueAxes(effects.length, extent, responseLabel, theme);
  const color = seriesColor(theme, 0);
  const series: (LineSeriesOption | CustomSeriesOption)[] = effects.flatMap((e, i) => [
    {
      type: 'custom',
      id: `ci:${e.factor}`,
      name: `${e.label} 95 % CI`,
      xAxisIndex: i,
      yAxisIndex: i,
      renderItem: ciCapsule(color, 12, theme.dark ? 0.4 : 0.26),
      data: e.points.flatMap((p, j) => (p.lower === null || p.upper === null ? [] : [[j, p.lower, p.upper]])),
      silent: true,
      z: 1,
    },
    {
      type: 'line',
      id: `line:${e.factor}`,
      name: e.label,
      xAxisIndex: i,
      yAxisIndex: i,
      data: e.points.map((p) => p.mean),
      symbol: 'circle',
      symbolSize: 10,
      itemStyle: { color, borderColor: theme.halo, borderWidth: 2 },
      lineStyle: { color, width: 2.5 },
      z: 3,
      markLine: {
        silent: true,
        symbol: 'none',
        lineStyle: { color: theme.reference, type: [6, 4], width: 1.2 },
        label: { show: i === 0, position: 'insideStartTop', formatter: 'overall mean', color: theme.reference, fontFamily: theme.fontFamily },
        data: [{ yAxis: grandMean }],
      },
    },
  ]);
  return {
    backgroundColor: 'transparent',
    textStyle: baseText(theme),
    animationDuration: 300,
    grid,
    xAxis,
    yAxis,
    tooltip: {
      ...tooltipStyle(theme),
      formatter: (params) => {
        const p = single(params);
        const e = effects[Math.floor((p.seriesIndex ?? 0) / 2)];
        const point = e?.points[p.dataIndex];
        return e && point ? pointTooltip(`${e.label} = ${point.x}`, point) : '';
      },
    },
    series,
  };
}

/**
 * Interaction plot: one line per level of `seriesFactor` across the levels of `xFactor`. The levels sit on
 * a numeric axis (0, 1, …) so each line can be nudged sideways a little; otherwise the CI capsules of
 * nearby means would hide each other. Non-parallel lines are what an interaction looks like.
 */
export function interactionOption(input: InteractionInput, responseLabel: string, theme: ChartTheme): ChartOption {
  const xLevels = firstSeen(input.points.map((p) => p.x));
  const seriesLevels = firstSeen(input.points.map((p) => p.series ?? ''));
  const s = seriesLevels.length;
  const dodge = Math.min(0.1, 0.45 / Math.max(s, 1));
  const extent = paddedExtent(input.points.flatMap((p) => [p.mean, p.lower, p.upper]));
  const perSeries = seriesLevels.map((level) =>
    xLevels.flatMap((x) => input.points.filter((p) => p.x === x && (p.series ?? '') === level)).sort((a, b) => xLevels.indexOf(a.x) - xLevels.indexOf(b.x)),
  );
  const offset = (i: number) => (i - (s - 1) / 2) * dodge;
  const lines: LineSeriesOption[] = seriesLevels.map((level, i) => {
    const color = seriesColor(theme, i);
    return {
      type: 'line',
      id: `line:${level}`,
      name: `${input.seriesLabel} = ${level}`,
      data: perSeries[i].map((p) => [xLevels.indexOf(p.x) + offset(i), p.mean]),
      symbol: seriesSymbol(i),
      symbolSize: 11,
      itemStyle: { color, borderColor: theme.halo, borderWidth: 1.5 },
      lineStyle: { color, width: 2.5, type: seriesDash(i) },
      z: 3,
    };
  });
  const capsules: CustomSeriesOption[] = seriesLevels.map((level, i) => ({
    type: 'custom',
    id: `ci:${level}`,
    name: `${input.seriesLabel} = ${level}, 95 % CI`,
    renderItem: ciCapsule(seriesColor(theme, i), 10, theme.dark ? 0.4 : 0.26),
    data: perSeries[i].flatMap((p) => (p.lower === null || p.upper === null ? [] : [[xLevels.indexOf(p.x) + offset(i), p.lower, p.upper]])),
    silent: true,
    z: 1,
  }));
  return {
    backgroundColor: 'transparent',
    textStyle: baseText(theme),
    animationDuration: 300,
    color: [...theme.series],
    legend: { ...legendStyle(theme), data: lines.map((l) => String(l.name)) },
    grid: { left: 64, right: 24, top: 40, bottom: 52 },
    xAxis: {
      type: 'value',
      name: input.xLabel,
      min: -0.5,
      max: xLevels.length - 0.5,
      ...levelAxisStyle(theme),
      // Ticks and labels only at the level positions 0, 1, …; the axis itself spans half a level more each side.
      axisTick: { ...levelAxisStyle(theme).axisTick, customValues: xLevels.map((_, i) => i) },
      axisLabel: { ...levelAxisStyle(theme).axisLabel, customValues: xLevels.map((_, i) => i), formatter: (v: number) => xLevels[Math.round(v)] ?? '' },
    },
    yAxis: { type: 'value', min: extent.min, max: extent.max, name: responseLabel, nameLocation: 'middle', nameGap: 48, ...valueAxisStyle(theme) },
    tooltip: {
      ...tooltipStyle(theme),
      formatter: (params) => {
        const p = single(params);
        const i = seriesLevels.findIndex((l) => p.seriesId === `line:${l}`);
        const point = i >= 0 ? perSeries[i][p.dataIndex] : undefined;
        return point ? pointTooltip(`${input.xLabel} = ${point.x}, ${input.seriesLabel} = ${point.series ?? ''}`, point) : '';
      },
    },
    series: [...capsules, ...lines],
  };
}
