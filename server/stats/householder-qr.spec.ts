import { describe, expect, it } from 'vitest';
import { qrCoefficients, qrResidualSs, sequentialQr } from './householder-qr';

describe('sequentialQr', () => {
  it('solves a small least-squares problem exactly and sets aside an aliased column', () => {
    // straight line through (0,1), (1,3), (2,5), (3,7): y = 1 + 2x exactly (textbook example)
    const ones = Float64Array.from([1, 1, 1, 1]);
    const x = Float64Array.from([0, 1, 2, 3]);
    const twiceXPlusOne = Float64Array.from([1, 3, 5, 7]);
    const y = Float64Array.from([1, 3, 5, 7]);
    const qr = sequentialQr([ones, x, twiceXPlusOne], y);
    expect(qr.accepted).toEqual([true, true, false]);
    expect(qr.rank).toBe(2);
    const b = qrCoefficients(qr);
    expect(b[0]).toBeCloseTo(1, 14);
    expect(b[1]).toBeCloseTo(2, 14);
    expect(qrResidualSs(qr)).toBeLessThan(1e-25);
  });

  it('gives the sequential sums of squares as squared effects', () => {
    // y = (1, 2, 4, 5) on intercept and x = (0, 0, 1, 1): SS(x | 1) = 4 * (1.5)^2 = 9, RSS = 4 * 0.25 = 1
    // (hand calculation: group means 1.5 and 4.5 around grand mean 3)
    const qr = sequentialQr([Float64Array.from([1, 1, 1, 1]), Float64Array.from([0, 0, 1, 1])], Float64Array.from([1, 2, 4, 5]));
    expect(qr.effects[1] ** 2).toBeCloseTo(9, 13);
    expect(qrResidualSs(qr)).toBeCloseTo(1, 13);
  });
});
