import type { EChartsOption } from 'echarts';
import { quantileSorted } from 'simple-statistics';
import { axisStyle, baseOption, fmt, seriesColour, type ChartTheme } from './theme.js';

/**
 * Box plots per level: quartiles by the common linear-interpolation quantile (simple-statistics),
 * whiskers to the furthest run within 1.5 IQR of the box (Tukey's rule), runs beyond drawn singly,
 * and the level mean as a diamond so a skewed level is visible at a glance.
 */

export interface LevelValues {
  level: string;
  values: number[];
}

export interface BoxStats {
  level: string;
  n: number;
  lowWhisker: number;
  q1: number;
  median: number;
  q3: number;
  highWhisker: number;
  mean: number;
  outliers: number[];
}

export function boxStats(g: LevelValues): BoxStats {
  const s = [...g.values].sort((a, b) => a - b);
  const q1 = quantileSorted(s, 0.25);
  const median = quantileSorted(s, 0.5);
  const q3 = quantileSorted(s, 0.75);
  const fence = 1.5 * (q3 - q1);
  const inside = s.filter((v) => v >= q1 - fence && v <= q3 + fence);
  return {
    level: g.level,
    n: s.length,
    lowWhisker: inside[0] ?? q1,
    q1,
    median,
    q3,
    highWhisker: inside[inside.length - 1] ?? q3,
    mean: s.reduce((a, b) => a + b, 0) / s.length,
    outliers: s.filter((v) => v < q1 - fence || v > q3 + fence),
  };
}

export function boxPlotOption(factor: string, groups: LevelValues[], opts: { theme: ChartTheme; response: string; caption: string }): EChartsOption {
  const { theme } = opts;
  const stats = groups.filter((g) => g.values.length > 0).map(boxStats);
  const colour = seriesColour(0, theme);
  const accent = seriesColour(1, theme);
  return {
    ...baseOption(theme, `${opts.response} by ${factor}`, opts.caption),
    tooltip: { trigger: 'item', confine: true },
    xAxis: { type: 'category', data: stats.map((s) => s.level), ...axisStyle(theme, factor), splitLine: { show: false } },
    yAxis: { type: 'value', scale: true, ...axisStyle(theme, opts.response), nameGap: 48 },
    series: [
      {
        type: 'boxplot',
        name: 'quartiles',
        data: stats.map((s) => [s.lowWhisker, s.q1, s.median, s.q3, s.highWhisker]),
        itemStyle: { color: theme.mode === 'dark' ? '#2a3440' : '#e8f1f8', borderColor: colour, borderWidth: 1.5 },
        boxWidth: [12, 40],
      },
      {
        type: 'scatter',
        name: 'mean',
        data: stats.map((s, i) => ({ value: [i, s.mean], name: `${s.level}: n = ${s.n}, mean = ${fmt(s.mean)}, median = ${fmt(s.median)}` })),
        symbol: 'diamond',
        symbolSize: 10,
        itemStyle: { color: accent },
        z: 3,
      },
      {
        type: 'scatter',
        name: 'beyond 1.5 IQR',
        data: stats.flatMap((s, i) => s.outliers.map((v) => [i, v])),
        symbol: 'emptyCircle',
        symbolSize: 7,
        itemStyle: { color: theme.text },
        z: 2,
      },
    ],
  };
}
