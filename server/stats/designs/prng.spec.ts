import { describe, expect, it } from 'vitest';
import { chiSquareUpperTail } from '../distributions.js';
import { mulberry32, shuffled } from './prng.js';

// No published table of mulberry32 outputs is cited here, so the generator is checked by its
// properties: determinism per seed, and uniformity / independence by standard goodness-of-fit
// tests (Knuth TAOCP vol. 2 §3.3.1 chi-square test; serial pair test §3.3.2). Seeds are fixed,
// so these tests are deterministic, yet they would fail for a broken generator (e.g. a constant,
// a short cycle, or a mix that leaves low bits patterned).

describe('mulberry32', () => {
  it('gives the same sequence for the same seed and different ones for different seeds', () => {
    const a = mulberry32(20240611);
    const b = mulberry32(20240611);
    const c = mulberry32(20240612);
    const sa = Array.from({ length: 100 }, () => a());
    expect(Array.from({ length: 100 }, () => b())).toEqual(sa);
    expect(Array.from({ length: 100 }, () => c())).not.toEqual(sa);
    expect(sa.every((u) => u >= 0 && u < 1)).toBe(true);
  });

  it('passes the chi-square frequency test on 100 equal bins (n = 200 000)', () => {
    const u = mulberry32(1);
    const counts = new Array<number>(100).fill(0);
    const n = 200_000;
    for (let i = 0; i < n; i++) counts[Math.floor(u() * 100)]++;
    const e = n / 100;
    const chi2 = counts.reduce((s, o) => s + (o - e) ** 2 / e, 0);
    // reject only at the 0.1 % level on either side (too uneven, or suspiciously even)
    const p = chiSquareUpperTail(chi2, 99);
    expect(p).toBeGreaterThan(0.001);
    expect(p).toBeLessThan(0.999);
  });

  it('passes the serial test on successive pairs (10 x 10 cells)', () => {
    const u = mulberry32(99);
    const counts = new Array<number>(100).fill(0);
    const n = 100_000;
    for (let i = 0; i < n; i++) counts[Math.floor(u() * 10) * 10 + Math.floor(u() * 10)]++;
    const e = n / 100;
    const chi2 = counts.reduce((s, o) => s + (o - e) ** 2 / e, 0);
    const p = chiSquareUpperTail(chi2, 99);
    expect(p).toBeGreaterThan(0.001);
    expect(p).toBeLessThan(0.999);
  });

  it('has mean 1/2 and variance 1/12 within sampling error', () => {
    // moments of U(0, 1); with n = 100 000 the mean's SD is 0.00091, so 5 SD is 0.0046
    const u = mulberry32(7);
    const xs = Array.from({ length: 100_000 }, () => u());
    const m = xs.reduce((a, b) => a + b, 0) / xs.length;
    const v = xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1);
    expect(Math.abs(m - 0.5)).toBeLessThan(0.0046);
    expect(Math.abs(v - 1 / 12)).toBeLessThan(0.002);
  });

  it('rejects a non-integer seed', () => {
    expect(() => mulberry32(1.5)).toThrow(/1.5/);
  });
});

describe('shuffled', () => {
  it('produces all 6 orders of 3 items about equally often (chi-square, 60 000 shuffles)', () => {
    const u = mulberry32(12345);
    const counts = new Map<string, number>();
    for (let i = 0; i < 60_000; i++) {
      const key = shuffled(['a', 'b', 'c'], u).join('');
      counts.set(key, (counts.get(key) ?? 0) + 1);
    }
    expect(counts.size).toBe(6);
    const chi2 = [...counts.values()].reduce((s, o) => s + (o - 10_000) ** 2 / 10_000, 0);
    expect(chiSquareUpperTail(chi2, 5)).toBeGreaterThan(0.001);
  });

  it('returns a permutation and leaves the input untouched', () => {
    const items = [1, 2, 3, 4, 5, 6, 7, 8];
    const out = shuffled(items, mulberry32(3));
    expect([...out].sort((a, b) => a - b)).toEqual(items);
    expect(items).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
  });
});
