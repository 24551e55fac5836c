import type { EChartsOption } from 'echarts';
import { normalUpperQuantile } from '../../stats/distributions.js';
import { axisStyle, baseOption, fmt, seriesColour, type ChartTheme } from './theme.js';

/**
 * Residual diagnostics: residuals against fitted values (a funnel means the scatter grows with the
 * level; a curve means a missing term), and the normal Q-Q plot of the residuals.
 */

/**
 * Plotting positions (i - a) / (n + 1 - 2a) with a = 3/8 for n <= 10 and 1/2 otherwise, as R's
 * ppoints() uses for qqnorm() (R documentation of ppoints, from memory).
 */
export function plottingPositions(n: number): number[] {
  const a = n <= 10 ? 3 / 8 : 1 / 2;
  return Array.from({ length: n }, (_, i) => (i + 1 - a) / (n + 1 - 2 * a));
}

export interface QqPoint {
  theoretical: number;
  sample: number;
  code: string;
}

export function qqPoints(residuals: number[], codes: string[]): QqPoint[] {
  const order = residuals.map((r, i) => ({ r, code: codes[i] ?? String(i + 1) })).sort((a, b) => a.r - b.r);
  const pos = plottingPositions(order.length);
  return order.map((o, i) => ({ theoretical: normalUpperQuantile(1 - pos[i]!), sample: o.r, code: o.code }));
}

/** The reference line through the first and third quartile points, as R's qqline() draws it. */
export function qqLine(points: QqPoint[]): { slope: number; intercept: number } {
  const s = points.map((p) => p.sample);
  const q = (p: number) => {
    const h = (s.length - 1) * p;
    const lo = Math.floor(h);
    return s[lo]! + (h - lo) * ((s[Math.min(lo + 1, s.length - 1)] ?? s[lo]!) - s[lo]!);
  };
  const z1 = normalUpperQuantile(0.75);
  const z3 = normalUpperQuantile(0.25);
  const slope = (q(0.75) - q(0.25)) / (z3 - z1);
  return { slope, intercept: q(0.25) - slope * z1 };
}

export function residualsOption(fitted: number[], residuals: number[], codes: string[], opts: { theme: ChartTheme; response: string; caption: string }): EChartsOption {
  const { theme } = opts;
  return {
    ...baseOption(theme, 'Residuals vs fitted', opts.caption),
    tooltip: { trigger: 'item', confine: true, formatter: (p) => String((p as { name?: string }).name ?? '') },
    xAxis: { type: 'value', scale: true, ...axisStyle(theme, `fitted ${opts.response}`) },
    yAxis: { type: 'value', ...axisStyle(theme, 'residual'), nameGap: 48 },
    series: [
      {
        type: 'scatter',
        name: 'runs',
        data: fitted.map((f, i) => ({ value: [f, residuals[i]!], name: `${codes[i] ?? i + 1}: fitted ${fmt(f)}, residual ${fmt(residuals[i])}` })),
        symbol: 'circle',
        symbolSize: 6,
        itemStyle: { color: seriesColour(0, theme), opacity: 0.75 },
        markLine: { silent: true, symbol: 'none', label: { show: false }, lineStyle: { color: theme.reference, type: [3, 3], width: 1 }, data: [{ yAxis: 0 }] },
      },
    ],
  };
}

export function qqOption(residuals: number[], codes: string[], opts: { theme: ChartTheme; caption: string }): EChartsOption {
  const { theme } = opts;
  const pts = qqPoints(residuals, codes);
  const line = pts.length >= 2 ? qqLine(pts) : { slope: 0, intercept: 0 };
  const zMin = pts[0]?.theoretical ?? -1;
  const zMax = pts[pts.length - 1]?.theoretical ?? 1;
  return {
    ...baseOption(theme, 'Normal Q-Q plot of residuals', opts.caption),
    tooltip: { trigger: 'item', confine: true, formatter: (p) => String((p as { name?: string }).name ?? '') },
    xAxis: { type: 'value', ...axisStyle(theme, 'normal quantile') },
    yAxis: { type: 'value', scale: true, ...axisStyle(theme, 'residual'), nameGap: 48 },
    series: [
      {
        type: 'scatter',
        name: 'residuals',
        data: pts.map((p) => ({ value: [p.theoretical, p.sample], name: `${p.code}: residual ${fmt(p.sample)}, normal quantile ${fmt(p.theoretical)}` })),
        symbol: 'circle',
        symbolSize: 6,
        itemStyle: { color: seriesColour(0, theme), opacity: 0.8 },
      },
      {
        type: 'line',
        name: 'quartile line',
        data: [[zMin, line.intercept + line.slope * zMin], [zMax, line.intercept + line.slope * zMax]],
        symbol: 'none',
        lineStyle: { color: seriesColour(1, theme), width: 1.5, type: [6, 3] },
        silent: true,
      },
    ],
  };
}
