import type { CustomSeriesOption, CustomSeriesRenderItem } from 'echarts';

/**
 * The house chart design, shared by the server's SVG report and the client's ngx-echarts panels.
 *
 * Colours: the Okabe–Ito palette (Okabe & Ito 2008, "Color Universal Design", from memory), which
 * stays distinguishable under the common colour-vision deficiencies. The yellow of that palette is
 * last because it is hard to see on white. Series never rely on colour alone: each also gets its own
 * marker shape and line dash, so charts survive grey-scale printing.
 */
export const PALETTE = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#000000', '#F0E442'] as const;
export const SHAPES = ['circle', 'rect', 'triangle', 'diamond', 'pin', 'arrow', 'roundRect', 'emptyCircle'] as const;
export const DASHES: ('solid' | number[])[] = ['solid', [8, 4], [2, 3], [10, 3, 2, 3], [4, 4], [12, 4, 2, 4, 2, 4]];

export type ChartMode = 'light' | 'dark';

export interface ChartTheme {
  mode: ChartMode;
  text: string;
  muted: string;
  axis: string;
  grid: string;
  background: string;
  /** colour of reference lines (grand mean, zero residual, Q-Q line) */
  reference: string;
  fontFamily: string;
}

export function chartTheme(mode: ChartMode = 'light'): ChartTheme {
  // Dark mode keeps the palette (all eight hues read on #1e1e1e except pure black, which is swapped
  // for a light grey below) and lightens text and axes.
  return mode === 'dark'
    ? { mode, text: '#e8e8e8', muted: '#b0b0b0', axis: '#9a9a9a', grid: '#3a3a3a', background: '#1e1e1e', reference: '#d0d0d0', fontFamily: 'Roboto, Helvetica, Arial, sans-serif' }
    : { mode, text: '#1d1d1f', muted: '#5a5a60', axis: '#6b6b70', grid: '#e3e3e6', background: '#ffffff', reference: '#3a3a3a', fontFamily: 'Helvetica, Arial, sans-serif' };
}

export function seriesColour(i: number, theme: ChartTheme): string {
  const c = PALETTE[i % PALETTE.length]!;
  return theme.mode === 'dark' && c === '#000000' ? '#d9d9d9' : c;
}

/** Axis styling common to every chart: thin axes, light grid, muted labels. */
export function axisStyle(theme: ChartTheme, name: string) {
  return {
    name,
    nameLocation: 'middle' as const,
    nameGap: 30,
    nameTextStyle: { color: theme.text, fontSize: 12, fontFamily: theme.fontFamily },
    // Axes stay at the edge of the grid: with onZero an axis would cut through the data at 0.
    axisLine: { onZero: false, lineStyle: { color: theme.axis } },
    axisTick: { lineStyle: { color: theme.axis } },
    axisLabel: { color: theme.muted, fontSize: 11, fontFamily: theme.fontFamily },
    splitLine: { lineStyle: { color: theme.grid, type: 'dashed' as const } },
  };
}

export function baseOption(theme: ChartTheme, title: string, subtitle: string) {
  return {
    animation: false,
    backgroundColor: theme.background,
    textStyle: { fontFamily: theme.fontFamily, color: theme.text },
    title: {
      text: title,
      subtext: subtitle,
      left: 8,
      top: 4,
      textStyle: { fontSize: 14, fontWeight: 'bold' as const, color: theme.text, fontFamily: theme.fontFamily },
      subtextStyle: { fontSize: 11, color: theme.muted, fontFamily: theme.fontFamily },
    },
    grid: { left: 64, right: 24, top: 64, bottom: 56 },
    tooltip: { trigger: 'item' as const, confine: true },
  };
}

/** Error bar data: [x, lower, upper]; x is the numeric position on a value axis. */
export type ErrorBarDatum = [number, number, number];

/** Vertical interval bars with short caps, drawn by a custom series so they work in SVG on the server. */
export function errorBarSeries(name: string, data: ErrorBarDatum[], colour: string, capHalfWidth = 5): CustomSeriesOption {
  const renderItem: CustomSeriesRenderItem = (_params, api) => {
    const x = Number(api.value(0));
    const lo = api.coord([x, Number(api.value(1))]);
    const hi = api.coord([x, Number(api.value(2))]);
    const style = { stroke: colour, lineWidth: 1.5, fill: 'none' };
    return {
      type: 'group',
      children: [
        { type: 'line', shape: { x1: lo[0]!, y1: lo[1]!, x2: hi[0]!, y2: hi[1]! }, style },
        { type: 'line', shape: { x1: lo[0]! - capHalfWidth, y1: lo[1]!, x2: lo[0]! + capHalfWidth, y2: lo[1]! }, style },
        { type: 'line', shape: { x1: hi[0]! - capHalfWidth, y1: hi[1]!, x2: hi[0]! + capHalfWidth, y2: hi[1]! }, style },
      ],
    };
  };
  return { type: 'custom', name, data, renderItem, encode: { x: 0, y: [1, 2] }, z: 1, silent: true, tooltip: { show: false } };
}

/** Four significant digits for axis labels and captions. */
export function fmt(x: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return 'n/a';
  if (x === 0) return '0';
  return Math.abs(x) >= 1e6 || Math.abs(x) < 1e-3 ? x.toExponential(3) : String(Number(x.toPrecision(4)));
}

/** "F(2, 48) = 4.189, p = 0.021" for chart captions (plain ASCII: the PDF's core fonts lack Greek). */
export function fCaption(row: { f: number; df: number; p: number } | undefined, residualDf: number): string {
  if (!row) return 'term not in the model';
  const p = row.p < 1e-16 ? 'p < 1e-16' : row.p < 0.001 ? `p = ${row.p.toExponential(2)}` : `p = ${Number(row.p.toPrecision(3))}`;
  return `F(${row.df}, ${residualDf}) = ${fmt(row.f)}, ${p}`;
}
