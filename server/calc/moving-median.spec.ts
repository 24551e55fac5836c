import { describe, expect, it } from 'vitest';
import { movingMedian } from './moving-median';

describe('movingMedian', () => {
  it('removes an isolated spike and keeps the ends (hand-computed medians)', () => {
    // window 3: median(0,1,9) = 1, median(1,9,3) = 3, median(9,3,4) = 4; ends keep their value.
    expect(movingMedian([0, 1, 9, 3, 4], 3)).toEqual([0, 1, 3, 4, 4]);
  });

  it('returns a linear series unchanged, ends included (symmetric shrinking window)', () => {
    const line = Array.from({ length: 12 }, (_, i) => 0.25 + 0.5 * i);
    expect(movingMedian(line, 5)).toEqual(line);
  });

  it('refuses even, zero or over-long windows', () => {
    expect(() => movingMedian([1, 2, 3, 4], 2)).toThrow(/smoothingWindow = 2 must be odd/);
    expect(() => movingMedian([1, 2, 3, 4], 0)).toThrow(/smoothingWindow = 0/);
    expect(() => movingMedian([1, 2, 3], 5)).toThrow(/smoothingWindow = 5 is longer than the series it smooths \(3 values\)/);
  });
});
