import type { EChartsCoreOption } from 'echarts/core';
import type { AngleResultDto, Hill48Result } from '../../../shared/calc';

/*
 * Options for the calculator's two charts, as pure functions of the data and a palette, so they are
 * unit-tested without a browser. Colours are the Okabe–Ito set (Wong, "Points of view: Color
 * blindness", Nature Methods 8 (2011) 441), and every series also differs by line style or marker
 * shape, so nothing depends on telling two hues apart.
 */

export interface ChartPalette {
  text: string;
  muted: string;
  grid: string;
  axis: string;
  primary: string;
  secondary: string;
  highlight: string;
  band: string;
  bandFill: string;
  inactive: string;
  tooltipBg: string;
}

export const LIGHT_PALETTE: ChartPalette = {
  text: '#1b1f24',
  muted: '#4a4f57',
  grid: '#dde1e6',
  axis: '#7b818a',
  primary: '#0072B2', // Okabe–Ito blue
  secondary: '#E69F00', // orange
  highlight: '#D55E00', // vermillion
  band: '#009E73', // bluish green
  bandFill: 'rgba(0, 158, 115, 0.14)',
  inactive: '#9aa0a8',
  tooltipBg: '#ffffff',
};

/** Dark mode keeps the same hue order with the lighter members of the set, readable on a dark surface. */
export const DARK_PALETTE: ChartPalette = {
  text: '#e3e5e8',
  muted: '#b9bec6',
  grid: '#3a3f46',
  axis: '#8d939c',
  primary: '#56B4E9', // sky blue
  secondary: '#E69F00',
  highlight: '#F0E442', // yellow
  band: '#3fd0a8',
  bandFill: 'rgba(63, 208, 168, 0.18)',
  inactive: '#737982',
  tooltipBg: '#24282e',
};

function axisStyle(p: ChartPalette, name: string) {
  return {
    name,
    nameLocation: 'middle' as const,
    nameGap: 32,
    nameTextStyle: { color: p.text, fontSize: 13 },
    axisLine: { lineStyle: { color: p.axis } },
    axisTick: { lineStyle: { color: p.axis } },
    axisLabel: { color: p.muted },
    splitLine: { lineStyle: { color: p.grid } },
  };
}

function common(p: ChartPalette) {
  return {
    backgroundColor: 'transparent',
    textStyle: { fontFamily: 'Roboto, system-ui, sans-serif', color: p.text },
    legend: { top: 4, textStyle: { color: p.text }, itemGap: 20 },
    tooltip: { backgroundColor: p.tooltipBg, borderColor: p.grid, textStyle: { color: p.text } },
    animation: false,
  };
}

const fmt = (v: number, d = 3) => v.toFixed(d);

/** Hill 1948 locus beside von Mises in the σ1–σ2 plane (τ = 0), both normalised by the RD yield stress. */
export function locusOptions(r: Hill48Result, p: ChartPalette): EChartsCoreOption {
  const all = [...r.locus.hill, ...r.locus.vonMises];
  const extent = Math.ceil(Math.max(...all.map((q) => Math.max(Math.abs(q.s1), Math.abs(q.s2)))) * 10 + 1) / 10;
  const k = r.locus.keyPoints;
  const points = [
    { name: 'uniaxial RD', value: [1, 0] },
    { name: 'uniaxial TD', value: [0, k.uniaxialTD] },
    { name: 'equibiaxial', value: [k.equibiaxial, k.equibiaxial] },
    { name: 'plane strain (ε̇2 = 0)', value: [k.planeStrainRD.s1, k.planeStrainRD.s2] },
  ];
  return {
    ...common(p),
    grid: { left: 64, right: 24, top: 44, bottom: 56 },
    xAxis: { type: 'value', min: -extent, max: extent, ...axisStyle(p, 'σ1 / σ0 (RD)') },
    yAxis: { type: 'value', min: -extent, max: extent, ...axisStyle(p, 'σ2 / σ0 (TD)'), nameGap: 40 },
    tooltip: { ...common(p).tooltip, trigger: 'item', formatter: (x: { seriesName: string; name: string; value: number[] }) => `${x.seriesName}${x.name ? ` · ${x.name}` : ''}<br>σ1/σ0 = ${fmt(x.value[0]!)}, σ2/σ0 = ${fmt(x.value[1]!)}` },
    series: [
      { name: 'Hill 1948', type: 'line', data: r.locus.hill.map((q) => [q.s1, q.s2]), showSymbol: false, lineStyle: { color: p.primary, width: 2.5 }, itemStyle: { color: p.primary } },
      { name: 'von Mises', type: 'line', data: r.locus.vonMises.map((q) => [q.s1, q.s2]), showSymbol: false, lineStyle: { color: p.secondary, width: 2, type: 'dashed' }, itemStyle: { color: p.secondary } },
      { name: 'Hill 1948 characteristic points', type: 'scatter', data: points, symbol: 'diamond', symbolSize: 11, itemStyle: { color: p.highlight, borderColor: p.text, borderWidth: 0.5 } },
    ],
  };
}

/** Angle against relative displacement, with the early maximum and the plateau band marked. */
export function angleOptions(r: AngleResultDto, p: ChartPalette): EChartsCoreOption {
  const unit = r.units.length;
  const point = (c: AngleResultDto['curve'][number]) => ({ value: [c.relativeDisplacement, c.angleDeg], frames: `${c.fromFrame} → ${c.toFrame}` });
  const used = r.curve.filter((c) => c.status === 'used' && c.angleDeg !== null).map(point);
  const below = r.curve.filter((c) => c.status === 'below-threshold' && c.angleDeg !== null).map(point);
  const plateau = r.plateau;
  const series: Record<string, unknown>[] = [
    {
      name: 'increment angle',
      type: 'line',
      data: used,
      symbol: 'circle',
      symbolSize: 4,
      lineStyle: { color: p.primary, width: 1.5 },
      itemStyle: { color: p.primary },
      markArea: plateau
        ? { silent: true, itemStyle: { color: p.bandFill }, data: [[{ xAxis: plateau.relativeDisplacementFrom, yAxis: plateau.minAngleDeg }, { xAxis: plateau.relativeDisplacementTo, yAxis: plateau.maxAngleDeg }]] }
        : undefined,
      markLine: plateau
        ? { silent: true, symbol: 'none', lineStyle: { color: p.band, type: 'dashed', width: 2 }, label: { color: p.band, formatter: `plateau ${fmt(plateau.meanAngleDeg, 2)}°`, position: 'insideEndTop' }, data: [{ yAxis: plateau.meanAngleDeg }] }
        : undefined,
    },
  ];
  if (below.length) series.push({ name: 'ignored (below threshold)', type: 'scatter', data: below, symbol: 'emptyCircle', symbolSize: 6, itemStyle: { color: p.inactive } });
  if (r.maximum) {
    series.push({
      name: 'early maximum',
      type: 'scatter',
      data: [{ value: [r.maximum.relativeDisplacement, r.maximum.angleDeg], frames: `${r.maximum.fromFrame} → ${r.maximum.toFrame}` }],
      symbol: 'triangle',
      symbolSize: 16,
      itemStyle: { color: p.highlight, borderColor: p.text, borderWidth: 0.8 },
      label: { show: true, position: 'top', color: p.text, formatter: `max ${fmt(r.maximum.angleDeg, 2)}°` },
      z: 5,
    });
  }
  if (plateau) series.push({ name: 'plateau band', type: 'line', data: [], lineStyle: { color: p.band, type: 'dashed', width: 2 }, itemStyle: { color: p.band } });
  const ys = [...used, ...below].map((d) => d.value[1] as number);
  // Whole multiples of 5° keep the ticks on round angles.
  const lo = Math.floor((Math.min(...ys) - 2) / 5) * 5;
  const hi = Math.ceil((Math.max(...ys) + 3) / 5) * 5;
  return {
    ...common(p),
    grid: { left: 64, right: 32, top: 48, bottom: 56 },
    xAxis: { type: 'value', ...axisStyle(p, `relative displacement |d − d₀| (${unit})`), min: 0 },
    yAxis: { type: 'value', ...axisStyle(p, 'angle from the loading axis (°)'), nameGap: 40, min: ys.length ? lo : undefined, max: ys.length ? hi : undefined },
    tooltip: {
      ...common(p).tooltip,
      trigger: 'item',
      formatter: (x: { seriesName: string; value: number[]; data: { frames?: string } }) => `${x.seriesName}<br>frames ${x.data.frames ?? ''}<br>${fmt(x.value[0]!, 4)} ${unit}, ${fmt(x.value[1]!, 3)}°`,
    },
    series,
  };
}
