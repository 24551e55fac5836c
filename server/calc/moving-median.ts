import { median } from 'simple-statistics';
import { CalcInputError } from './errors';
import { requireInteger } from './input-checks';

/**
 * Centred moving median with a symmetric window that shrinks near the ends (half-width
 * min(h, i, n − 1 − i)). Keeping the window symmetric means a series that is linear in the index is
 * returned unchanged — end points included — so smoothing cannot bend a steady relative motion.
 * A median rather than a mean because image-correlation outliers (a lost facet) are isolated spikes.
 * @param values the series (finite numbers)
 * @param window odd window length; 1 returns a copy
 * @returns the smoothed series, same length
 * @throws {CalcInputError} if window is not an odd whole number ≥ 1 or exceeds the series length
 * @example movingMedian([0, 1, 9, 3, 4], 3) // [0, 1, 3, 4, 4]
 */
export function movingMedian(values: readonly number[], window: number): number[] {
  requireInteger(window, 'smoothingWindow', 1);
  if (window % 2 === 0) {
    throw new CalcInputError(`smoothingWindow = ${window} must be odd so the window is centred on its frame`, {
      field: 'smoothingWindow',
      value: window,
    });
  }
  if (window > values.length) {
    throw new CalcInputError(`smoothingWindow = ${window} is longer than the series it smooths (${values.length} values)`, {
      field: 'smoothingWindow',
      value: window,
    });
  }
  const h = (window - 1) / 2;
  const n = values.length;
  return values.map((v, i) => {
    const k = Math.min(h, i, n - 1 - i);
    return k === 0 ? v : median(values.slice(i - k, i + k + 1));
  });
}
