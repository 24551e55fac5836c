import type { BarSeriesOption, BoxplotSeriesOption, CustomSeriesOption, LineSeriesOption, ScatterSeriesOption } from 'echarts/charts';
import type {
  GridComponentOption,
  LegendComponentOption,
  MarkAreaComponentOption,
  MarkLineComponentOption,
  TitleComponentOption,
  TooltipComponentOption,
} from 'echarts/components';
import type { ComposeOption } from 'echarts/core';
import type { CustomSeriesRenderItemAPI, CustomSeriesRenderItemParams, CustomSeriesRenderItemReturn, YAXisComponentOption } from 'echarts';
import type { ChartTheme } from './chart-theme';
import { formatNumber } from './format';

/** Every option a Specimetry chart builder returns: only the parts registered in core/echarts-setup.ts. */
export type ChartOption = ComposeOption<
  | LineSeriesOption
  | ScatterSeriesOption
  | BarSeriesOption
  | BoxplotSeriesOption
  | CustomSeriesOption
  | GridComponentOption
  | LegendComponentOption
  | TooltipComponentOption
  | TitleComponentOption
  | MarkLineComponentOption
  | MarkAreaComponentOption
>;

export type SeriesOption = LineSeriesOption | ScatterSeriesOption | BarSeriesOption | BoxplotSeriesOption | CustomSeriesOption;

/** The series of an option as an array, whatever form the option holds them in. */
export function seriesOf(option: ChartOption): SeriesOption[] {
  const s = option.series;
  if (s === undefined) return [];
  return (Array.isArray(s) ? s : [s]) as SeriesOption[];
}

/**
 * Axis bounds that hold every value with a margin, rounded out to a round step (1, 2 or 5 × 10^k), so
 * CI capsules never touch the frame and the end labels are round numbers rather than 1.0583.
 */
export function paddedExtent(values: readonly (number | null)[], pad = 0.06): { min: number; max: number } {
  const finite = values.filter((v): v is number => v !== null && Number.isFinite(v));
  if (finite.length === 0) return { min: 0, max: 1 };
  let min = Math.min(...finite);
  let max = Math.max(...finite);
  if (min === max) {
    const half = Math.abs(min) * 0.05 || 0.5;
    min -= half;
    max += half;
  }
  const margin = (max - min) * pad;
  min -= margin;
  max += margin;
  const raw = (max - min) / 5;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const ratio = raw / mag;
  const step = mag * (ratio < 1.5 ? 1 : ratio < 3 ? 2 : ratio < 7 ? 5 : 10);
  const round = (v: number) => Number(v.toPrecision(12));
  return { min: round(Math.floor(min / step) * step), max: round(Math.ceil(max / step) * step) };
}

export function baseText(theme: ChartTheme) {
  return { color: theme.text, fontFamily: theme.fontFamily, fontSize: 12 };
}

/** Value axis of our look: no axis line, dotted guides, muted tick labels. */
export function valueAxisStyle(theme: ChartTheme) {
  return {
    axisLine: { show: false },
    axisTick: { show: false },
    axisLabel: { color: theme.muted, fontFamily: theme.fontFamily, formatter: (v: number) => formatNumber(v, 4) },
    splitLine: { lineStyle: { color: theme.guide, type: [2, 4] as number[] } },
    nameTextStyle: { color: theme.muted, fontFamily: theme.fontFamily },
  };
}

/**
 * One value axis per panel of a row of small multiples, all on the same scale so panels compare at a
 * glance; only the first carries the response name and tick labels.
 */
export function sharedValueAxes(panels: number, extent: { min: number; max: number }, responseLabel: string, theme: ChartTheme): YAXisComponentOption[] {
  return Array.from({ length: panels }, (_, i) => ({
    type: 'value' as const,
    gridIndex: i,
    min: extent.min,
    max: extent.max,
    name: i === 0 ? responseLabel : '',
    nameLocation: 'middle' as const,
    nameGap: 48,
    ...valueAxisStyle(theme),
    axisLabel: { ...valueAxisStyle(theme).axisLabel, show: i === 0 },
  }));
}

/** Category-like axis: a solid baseline, short outward ticks, the factor name underneath. */
export function levelAxisStyle(theme: ChartTheme) {
  return {
    axisLine: { show: true, lineStyle: { color: theme.muted, width: 1 } },
    axisTick: { show: true, length: 4, lineStyle: { color: theme.muted } },
    axisLabel: { color: theme.text, fontFamily: theme.fontFamily },
    splitLine: { show: false },
    nameLocation: 'middle' as const,
    nameGap: 28,
    nameTextStyle: { color: theme.text, fontFamily: theme.fontFamily, fontWeight: 500 as const },
  };
}

export function tooltipStyle(theme: ChartTheme): TooltipComponentOption {
  return {
    trigger: 'item',
    backgroundColor: theme.surface,
    borderColor: theme.muted,
    borderWidth: 1,
    textStyle: { color: theme.text, fontFamily: theme.fontFamily, fontSize: 12 },
    extraCssText: 'border-radius: 6px; box-shadow: none;',
  };
}

export function legendStyle(theme: ChartTheme): LegendComponentOption {
  return { top: 0, left: 'center', itemWidth: 22, itemHeight: 10, textStyle: { color: theme.text, fontFamily: theme.fontFamily } };
}

/**
 * A confidence interval drawn as a translucent capsule (a rounded bar as wide as the marker) instead of
 * an error bar with caps: the interval reads as a region the mean may lie in, not as a hard limit.
 * Data per item: [x, lower, upper]; x may be a category index or a value.
 */
export function ciCapsule(color: string, width = 10, opacity = 0.26): CustomSeriesOption['renderItem'] {
  return (_params: CustomSeriesRenderItemParams, api: CustomSeriesRenderItemAPI): CustomSeriesRenderItemReturn => {
    const x = Number(api.value(0));
    const top = api.coord([x, Number(api.value(2))]);
    const bottom = api.coord([x, Number(api.value(1))]);
    const height = Math.max(bottom[1] - top[1], 2);
    return {
      type: 'rect',
      shape: { x: top[0] - width / 2, y: top[1], width, height, r: width / 2 },
      style: { fill: color, opacity, stroke: color, lineWidth: 1 },
    };
  };
}

export function ciTooltipLine(lower: number | null, upper: number | null): string {
  return lower === null || upper === null ? '95 % CI: needs n ≥ 2' : `95 % CI: ${formatNumber(lower)} to ${formatNumber(upper)}`;
}

/** HTML-escapes level labels and codes put into tooltips (they are user-entered text). */
export function esc(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}
