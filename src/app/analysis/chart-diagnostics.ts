import type { BoxplotSeriesOption, LineSeriesOption, ScatterSeriesOption } from 'echarts/charts';
import type { GridComponentOption } from 'echarts/components';
import type { XAXisComponentOption } from 'echarts';
import jstatPkg from 'jstat';
import { quantileSorted } from 'simple-statistics';
import { type ChartTheme, seriesColor } from './chart-theme';
import { type ChartOption, baseText, esc, levelAxisStyle, paddedExtent, sharedValueAxes, tooltipStyle, valueAxisStyle } from './chart-kit';
import { formatNumber } from './format';

// jstat exposes a default export under Node ESM and bundlers alike (STACK.md pitfall 7). Its normal
// inverse is used rather than simple-statistics' probit, whose approximation is off by ~3e-4 in the tails.
const { jStat } = jstatPkg;
const probit = (p: number): number => jStat.normal.inv(p, 0, 1);

export interface LevelValues {
  level: string;
  values: number[];
}

export interface FactorSpread {
  factor: string;
  label: string;
  levels: LevelValues[];
}

/** Tukey's box: quartiles by linear interpolation (R type 7), whiskers to the furthest run within 1.5 IQR. */
export function boxStats(values: readonly number[]): { box: [number, number, number, number, number]; outliers: number[] } {
  if (values.length === 0) throw new RangeError('boxStats needs at least one value, got an empty list');
  const sorted = [...values].sort((a, b) => a - b);
  const q1 = quantileSorted(sorted, 0.25);
  const med = quantileSorted(sorted, 0.5);
  const q3 = quantileSorted(sorted, 0.75);
  const reach = 1.5 * (q3 - q1);
  const inside = sorted.filter((v) => v >= q1 - reach && v <= q3 + reach);
  return { box: [inside[0], q1, med, q3, inside[inside.length - 1]], outliers: sorted.filter((v) => v < q1 - reach || v > q3 + reach) };
}

/**
 * Box plots per level, one panel per factor, with every run drawn over its box as a small dot: with
 * the handful of runs per level typical of a lab study, the dots say more than the box does.
 */
export function boxPlotOption(factors: readonly FactorSpread[], responseLabel: string, theme: ChartTheme): ChartOption {
  const k = Math.max(factors.length, 1);
  const span = 88 / k;
  const extent = paddedExtent(factors.flatMap((f) => f.levels.flatMap((l) => l.values)));
  const grid: GridComponentOption[] = factors.map((_, i) => ({ left: `${9 + i * span}%`, width: `${span - 3}%`, top: 16, bottom: 48 }));
  const xAxis: XAXisComponentOption[] = factors.map((f, i) => ({ type: 'category', gridIndex: i, name: f.label, data: f.levels.map((l) => l.level), ...levelAxisStyle(theme) }));
  const yAxis = sharedValueAxes(factors.length, extent, responseLabel, theme);
  const box = seriesColor(theme, 0);
  const dot = seriesColor(theme, 1);
  const series: (BoxplotSeriesOption | ScatterSeriesOption)[] = factors.flatMap((f, i) => {
    const stats = f.levels.map((l) => (l.values.length > 0 ? boxStats(l.values) : null));
    return [
      {
        type: 'boxplot',
        id: `box:${f.factor}`,
        xAxisIndex: i,
        yAxisIndex: i,
        boxWidth: [10, 26],
        data: stats.map((s) => s?.box ?? []),
        itemStyle: { color: theme.dark ? 'rgba(86, 180, 233, 0.14)' : 'rgba(0, 114, 178, 0.10)', borderColor: box, borderWidth: 1.6 },
        tooltip: { show: false },
      },
      {
        type: 'scatter',
        id: `runs:${f.factor}`,
        xAxisIndex: i,
        yAxisIndex: i,
        symbolSize: 6,
        data: f.levels.flatMap((l, j) => l.values.map((v) => [j, v])),
        itemStyle: { color: dot, opacity: 0.85, borderColor: theme.halo, borderWidth: 0.5 },
      },
    ];
  });
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
        const p = Array.isArray(params) ? params[0] : params;
        const f = factors[Math.floor((p.seriesIndex ?? 0) / 2)];
        const value = Array.isArray(p.value) ? Number(p.value[1]) : Number(p.value);
        return f ? `<b>${esc(f.label)}</b><br/>run value ${formatNumber(value)}` : '';
      },
    },
    series,
  };
}

/**
 * Residuals against fitted values, with a band of ±2 residual SD: a funnel or a curve in the cloud points
 * at non-constant variance or a missing term; runs outside the band deserve a look at the bench record.
 */
export function residualsOption(fitted: readonly number[], residuals: readonly number[], codes: readonly string[], residualSd: number, theme: ChartTheme): ChartOption {
  if (fitted.length !== residuals.length) throw new RangeError(`fitted has ${fitted.length} values but residuals has ${residuals.length}`);
  const band = 2 * residualSd;
  const extent = paddedExtent([...residuals, band, -band]);
  const xExtent = paddedExtent(fitted);
  const color = seriesColor(theme, 0);
  const points: ScatterSeriesOption = {
    type: 'scatter',
    id: 'residuals',
    data: fitted.map((f, i) => [f, residuals[i]]),
    symbolSize: 8,
    itemStyle: { color, opacity: 0.8, borderColor: theme.halo, borderWidth: 1 },
    markLine: { silent: true, symbol: 'none', lineStyle: { color: theme.reference, type: [6, 4] }, label: { show: false }, data: [{ yAxis: 0 }] },
    markArea: {
      silent: true,
      itemStyle: { color: theme.dark ? 'rgba(221, 228, 229, 0.06)' : 'rgba(24, 34, 36, 0.05)' },
      label: { show: true, position: 'insideTopRight', formatter: '±2 s', color: theme.muted },
      data: [[{ yAxis: -band }, { yAxis: band }]],
    },
  };
  return {
    backgroundColor: 'transparent',
    textStyle: baseText(theme),
    animationDuration: 300,
    grid: { left: 64, right: 24, top: 16, bottom: 52 },
    xAxis: { type: 'value', name: 'fitted value', min: xExtent.min, max: xExtent.max, ...valueAxisStyle(theme), nameLocation: 'middle', nameGap: 30 },
    yAxis: { type: 'value', name: 'residual', min: extent.min, max: extent.max, nameLocation: 'middle', nameGap: 48, ...valueAxisStyle(theme) },
    tooltip: {
      ...tooltipStyle(theme),
      formatter: (params) => {
        const p = Array.isArray(params) ? params[0] : params;
        const i = p.dataIndex;
        return `<b>run ${esc(codes[i] ?? String(i + 1))}</b><br/>fitted ${formatNumber(fitted[i])}<br/>residual ${formatNumber(residuals[i])}`;
      },
    },
    series: [points],
  };
}

/**
 * Normal Q-Q plot of residuals. Plotting positions (i - 3/8) / (n + 1/4) (Blom 1958), the usual choice
 * for normal scores; the reference line passes through the first and third quartiles of both the
 * sample and the normal distribution, as R's qqline draws it.
 */
export function qqOption(residuals: readonly number[], theme: ChartTheme): ChartOption {
  const n = residuals.length;
  if (n < 3) throw new RangeError(`a Q-Q plot needs at least 3 residuals, got ${n}`);
  const sorted = [...residuals].sort((a, b) => a - b);
  const theoretical = sorted.map((_, i) => probit((i + 1 - 0.375) / (n + 0.25)));
  const zq1 = probit(0.25);
  const zq3 = probit(0.75);
  const q1 = quantileSorted(sorted, 0.25);
  const q3 = quantileSorted(sorted, 0.75);
  const slope = (q3 - q1) / (zq3 - zq1);
  const intercept = q1 - slope * zq1;
  const zMin = theoretical[0];
  const zMax = theoretical[n - 1];
  const line: LineSeriesOption = {
    type: 'line',
    id: 'qq-line',
    data: [
      [zMin, intercept + slope * zMin],
      [zMax, intercept + slope * zMax],
    ],
    symbol: 'none',
    lineStyle: { color: theme.reference, type: [6, 4], width: 1.5 },
    silent: true,
    tooltip: { show: false },
  };
  const points: ScatterSeriesOption = {
    type: 'scatter',
    id: 'qq-points',
    data: sorted.map((r, i) => [theoretical[i], r]),
    symbolSize: 8,
    itemStyle: { color: seriesColor(theme, 0), opacity: 0.8, borderColor: theme.halo, borderWidth: 1 },
  };
  return {
    backgroundColor: 'transparent',
    textStyle: baseText(theme),
    animationDuration: 300,
    grid: { left: 64, right: 24, top: 16, bottom: 52 },
    xAxis: { type: 'value', name: 'normal quantile', scale: true, ...valueAxisStyle(theme), nameLocation: 'middle', nameGap: 30 },
    yAxis: { type: 'value', name: 'residual', ...paddedExtent(sorted), nameLocation: 'middle', nameGap: 48, ...valueAxisStyle(theme) },
    tooltip: {
      ...tooltipStyle(theme),
      formatter: (params) => {
        const p = Array.isArray(params) ? params[0] : params;
        return `normal quantile ${formatNumber(theoretical[p.dataIndex], 3)}<br/>residual ${formatNumber(sorted[p.dataIndex])}`;
      },
    },
    series: [line, points],
  };
}

/** One setting (cell) for the dispersion chart. */
export interface SettingSpread {
  label: string;
  n: number;
  mean: number;
  sd: number | null;
}

export type SpreadMetric = 'sd' | 'lnVariance';

/**
 * Scatter per setting as a dot-and-stem row, settings ordered from least to most scatter (top down), so
 * the quietest settings are read first. Settings with one run have no scatter estimate and are left out
 * (the panel lists them).
 */
export function dispersionOption(settings: readonly SettingSpread[], metric: SpreadMetric, theme: ChartTheme): ChartOption {
  const rows = settings
    .filter((s): s is SettingSpread & { sd: number } => s.sd !== null && (metric === 'sd' || s.sd > 0))
    .map((s) => ({ ...s, value: metric === 'sd' ? s.sd : Math.log(s.sd * s.sd) }))
    .sort((a, b) => b.value - a.value);
  const color = seriesColor(theme, 2);
  const name = metric === 'sd' ? 'SD within setting' : 'ln s² within setting';
  return {
    backgroundColor: 'transparent',
    textStyle: baseText(theme),
    animationDuration: 300,
    grid: { left: 16, right: 32, top: 16, bottom: 48, containLabel: true },
    xAxis: { type: 'value', name, nameLocation: 'middle', nameGap: 30, scale: metric === 'lnVariance', ...valueAxisStyle(theme) },
    yAxis: { type: 'category', data: rows.map((r) => r.label), ...levelAxisStyle(theme), axisTick: { show: false }, nameGap: 8 },
    tooltip: {
      ...tooltipStyle(theme),
      formatter: (params) => {
        const p = Array.isArray(params) ? params[0] : params;
        const r = rows[p.dataIndex];
        return r ? `<b>${esc(r.label)}</b><br/>n = ${r.n}<br/>mean = ${formatNumber(r.mean)}<br/>SD = ${formatNumber(r.sd)}` : '';
      },
    },
    series: [
      // Stems from zero only for the SD: ln s² is negative for small scatter, and a stem would then grow
      // longer as the scatter shrinks.
      ...(metric === 'sd'
        ? [{ type: 'bar' as const, id: 'stem', data: rows.map((r) => r.value), barWidth: 3, itemStyle: { color, opacity: 0.55 }, tooltip: { show: false }, silent: true }]
        : []),
      { type: 'scatter', id: 'spread', data: rows.map((r, i) => [r.value, i]), symbol: 'circle', symbolSize: 12, itemStyle: { color, borderColor: theme.halo, borderWidth: 2 } },
    ],
  };
}
