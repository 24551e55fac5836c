import { paddedExtent } from './chart-kit';

describe('paddedExtent', () => {
  it('holds every value and ends on round steps', () => {
    // warpbreaks cell CI ends, roughly 30.6 to 58.5 (R 4.2.2 cell summary, warpbreaks.json): steps of 5
    const { min, max } = paddedExtent([30.63, 58.47, null, 44.56]);
    expect(min).toBeLessThan(30.63);
    expect(max).toBeGreaterThan(58.47);
    expect(min % 5).toBe(0);
    expect(max % 5).toBe(0);
  });

  it('widens a single value into a small range instead of a zero-height axis', () => {
    const { min, max } = paddedExtent([1.25]);
    expect(min).toBeLessThan(1.25);
    expect(max).toBeGreaterThan(1.25);
  });

  it('falls back to 0..1 when nothing is finite', () => {
    expect(paddedExtent([null, Number.NaN])).toEqual({ min: 0, max: 1 });
  });
});
