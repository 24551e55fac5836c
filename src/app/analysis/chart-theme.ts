/**
 * Colours and marks for every Specimetry chart, in light and dark mode.
 *
 * Series colours are the Okabe–Ito set (Okabe & Ito 2008, "Color Universal Design"), which stays
 * distinguishable for the common forms of colour-vision deficiency. The order differs per mode so the
 * first series always has strong contrast with the background: the dark blue leads on light paper and
 * goes last on a dark surface; yellow goes last on light paper, where it is faint. Every series also gets
 * its own marker shape and line dash, so no chart relies on colour alone.
 */

export interface ChartTheme {
  dark: boolean;
  /** page surface behind the chart; also the PNG/SVG background on download */
  surface: string;
  text: string;
  muted: string;
  /** dotted guide lines */
  guide: string;
  /** reference lines (grand mean, zero residual, Q-Q line) */
  reference: string;
  /** ring around markers that lifts them off crossing lines */
  halo: string;
  series: readonly string[];
  fontFamily: string;
}

const OKABE_ITO_LIGHT = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#F0E442'] as const;
const OKABE_ITO_DARK = ['#56B4E9', '#E69F00', '#009E73', '#F0E442', '#CC79A7', '#D55E00', '#0072B2'] as const;

/** Marker per series index: filled circle first, then shapes that differ in outline, not only size. */
export const SERIES_SYMBOLS = ['circle', 'diamond', 'triangle', 'rect', 'roundRect', 'pin', 'arrow'] as const;
/** Line dash per series index, paired with the marker shapes. */
export const SERIES_DASHES: readonly (number[] | 'solid')[] = ['solid', [8, 4], [2, 3], [10, 3, 2, 3], 'solid', [6, 6], [2, 6]];

export function chartTheme(dark: boolean): ChartTheme {
  return dark
    ? {
        dark,
        surface: '#161d1e',
        text: '#dde4e5',
        muted: '#a3b1b3',
        guide: 'rgba(221, 228, 229, 0.16)',
        reference: '#ffb95c',
        halo: '#161d1e',
        series: OKABE_ITO_DARK,
        fontFamily: 'Roboto, system-ui, sans-serif',
      }
    : {
        dark,
        surface: '#fbfdfd',
        text: '#182224',
        muted: '#4f5d60',
        guide: 'rgba(24, 34, 36, 0.14)',
        reference: '#8a5100',
        halo: '#fbfdfd',
        series: OKABE_ITO_LIGHT,
        fontFamily: 'Roboto, system-ui, sans-serif',
      };
}

export function seriesColor(theme: ChartTheme, index: number): string {
  return theme.series[index % theme.series.length];
}

export function seriesSymbol(index: number): (typeof SERIES_SYMBOLS)[number] {
  return SERIES_SYMBOLS[index % SERIES_SYMBOLS.length];
}

export function seriesDash(index: number): number[] | 'solid' {
  return SERIES_DASHES[index % SERIES_DASHES.length];
}
