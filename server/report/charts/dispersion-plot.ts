import type { EChartsOption } from 'echarts';
import type { GroupDescriptives } from '../../stats/types.js';
import { axisStyle, baseOption, fmt, seriesColour, type ChartTheme } from './theme.js';

/**
 * Scatter per setting: the SD of each cell as a bar (or ln s², the scale on which dispersion effects
 * are analysed), with n on each bar because an SD from three runs is itself very uncertain.
 */
export function dispersionOption(cells: GroupDescriptives[], opts: { theme: ChartTheme; response: string; caption: string; scale?: 'sd' | 'lnVar' }): EChartsOption {
  const { theme } = opts;
  const scale = opts.scale ?? 'sd';
  const usable = cells.filter((c) => c.sd !== null && c.sd > 0);
  const value = (c: GroupDescriptives) => (scale === 'sd' ? c.sd! : Math.log(c.variance!));
  return {
    ...baseOption(theme, scale === 'sd' ? `Scatter of ${opts.response} per setting (SD)` : `Scatter of ${opts.response} per setting (ln s^2)`, opts.caption),
    tooltip: { trigger: 'item', confine: true, formatter: (p) => String((p as { name?: string }).name ?? '') },
    grid: { left: 64, right: 24, top: 64, bottom: 72 },
    xAxis: { type: 'category', data: usable.map((c) => c.label), ...axisStyle(theme, 'setting'), nameGap: 46, splitLine: { show: false }, axisLabel: { ...axisStyle(theme, 'setting').axisLabel, rotate: usable.length > 8 ? 40 : 0 } },
    yAxis: { type: 'value', ...axisStyle(theme, scale === 'sd' ? `SD of ${opts.response}` : 'ln s^2'), nameGap: 48, scale: scale !== 'sd' },
    series: [
      {
        type: 'bar',
        name: scale,
        data: usable.map((c) => ({ value: value(c), name: `${c.label}: n = ${c.n}, SD = ${fmt(c.sd)}, mean = ${fmt(c.mean)}` })),
        itemStyle: { color: seriesColour(2, theme), borderColor: theme.text, borderWidth: 0.5 },
        barMaxWidth: 36,
        label: { show: true, position: 'top', formatter: (p) => `n=${usable[(p as { dataIndex: number }).dataIndex]?.n ?? ''}`, color: theme.muted, fontSize: 10 },
      },
    ],
  };
}
