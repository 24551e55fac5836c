import type { PlotPoint } from '../../../shared/analysis';

/**
 * Cell means of R's warpbreaks data (breaks by wool A/B and tension L/M/H, 9 runs per cell), copied from
 * shared/reference/r-datasets/warpbreaks.json `cellSummary` (R 4.2.2, aggregate(breaks ~ wool + tension)).
 * The unit specs cannot read files (they run in the browser bundle), so the values are restated here.
 * CIs are mean ± t(0.975, 8) · sd / 3 with t(0.975, 8) = 2.306004 (R qt(0.975, 8), from memory).
 */
const CELLS: { wool: string; tension: string; mean: number; sd: number }[] = [
  { wool: 'A', tension: 'L', mean: 44.5555555555556, sd: 18.0977285253641 },
  { wool: 'B', tension: 'L', mean: 28.2222222222222, sd: 9.85872428078017 },
  { wool: 'A', tension: 'M', mean: 24, sd: 8.66025403784439 },
  { wool: 'B', tension: 'M', mean: 28.7777777777778, sd: 9.43103623386341 },
  { wool: 'A', tension: 'H', mean: 24.5555555555556, sd: 10.2726714041567 },
  { wool: 'B', tension: 'H', mean: 18.7777777777778, sd: 4.89330608530107 },
];

const T = 2.306004;

/** Interaction points with tension on the x axis and one line per wool, in standard order. */
export const WARPBREAKS_POINTS: PlotPoint[] = CELLS.map((c) => ({
  x: c.tension,
  series: c.wool,
  n: 9,
  mean: c.mean,
  lower: c.mean - (T * c.sd) / 3,
  upper: c.mean + (T * c.sd) / 3,
}));

/** summary(aov(breaks ~ wool * tension, data = warpbreaks)), shared/reference/r-datasets/warpbreaks.json `twoWay.table`. */
export const WARPBREAKS_ANOVA = [
  { source: 'wool', df: 1, ss: 450.666666666667, ms: 450.666666666667, f: 3.76528836111863, p: 0.0582129759595598, partialEtaSq: 450.666666666667 / (450.666666666667 + 5745.11111111111) },
  { source: 'tension', df: 2, ss: 2034.25925925926, ms: 1017.12962962963, f: 8.49804664835802, p: 0.000692620936713445, partialEtaSq: 2034.25925925926 / (2034.25925925926 + 5745.11111111111) },
  { source: 'wool:tension', df: 2, ss: 1002.77777777778, ms: 501.388888888888, f: 4.18906896685103, p: 0.0210441907278632, partialEtaSq: 1002.77777777778 / (1002.77777777778 + 5745.11111111111) },
  { source: 'Residual' as const, df: 48, ss: 5745.11111111111, ms: 119.689814814815 },
];
