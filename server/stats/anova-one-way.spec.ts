import { describe, expect, it } from 'vitest';
import { fSentence, oneWayAnova } from './anova-one-way';
import { StatsInputError } from './errors';
import { coded, loadReference, relErr, type RDataset, type RTableRow } from './reference-data.spec-helper';

const warpbreaks = loadReference<RDataset & { oneWayTension: { table: RTableRow[]; etaSquared: number; omegaSquared: number } }>(
  'r-datasets/warpbreaks.json',
);

describe('oneWayAnova', () => {
  const { y, factors } = coded(warpbreaks, ['tension'], 'breaks');
  const tension = factors[0];
  const groups = tension.levels.map((label, li) => ({ label, values: Array.from(y).filter((_, i) => tension.codes[i] === li) }));

  it('matches R for warpbreaks ~ tension, with eta squared and omega squared', () => {
    // R 4.2.2 summary(aov(breaks ~ tension)) and eta2 = SSB/SST, omega2 = (SSB - dfB MSW)/(SST + MSW)
    // (shared/reference/r-datasets/warpbreaks.json oneWayTension)
    const ref = warpbreaks.oneWayTension;
    const r = oneWayAnova(groups, 'tension');
    expect(r.effect.df).toBe(2);
    expect(r.residual.df).toBe(51);
    expect(relErr(r.effect.ss, ref.table[0].ss as number)).toBeLessThan(1e-12);
    expect(relErr(r.effect.f, ref.table[0].f as number)).toBeLessThan(1e-12);
    expect(relErr(r.effect.p, ref.table[0].p as number)).toBeLessThan(1e-12);
    expect(relErr(r.residual.ss, ref.table[1].ss as number)).toBeLessThan(1e-12);
    expect(relErr(r.etaSq, ref.etaSquared)).toBeLessThan(1e-12);
    expect(relErr(r.omegaSq, ref.omegaSquared)).toBeLessThan(1e-12);
    expect(r.sentence).toBe('F(2, 51) = 7.206, p = 0.00175');
  });

  it('reproduces the NIST/SEMATECH e-Handbook one-way example', () => {
    // NIST/SEMATECH e-Handbook of Statistical Methods, section 7.4.3 one-way ANOVA example (from memory):
    // three groups of five; SS treatments 27.897, SS error 17.452, F = 9.59 (printed to those digits)
    const r = oneWayAnova([
      [6.9, 5.4, 5.8, 4.6, 4.0],
      [8.3, 6.8, 7.8, 9.2, 6.5],
      [8.0, 10.5, 8.1, 6.9, 9.3],
    ]);
    expect(r.effect.ss).toBeCloseTo(27.897, 3);
    expect(r.residual.ss).toBeCloseTo(17.452, 3);
    expect(r.effect.f).toBeCloseTo(9.59, 2);
  });

  it('formats the sentence with tiny p as a bound', () => {
    // common practice, no source
    expect(fSentence(91.99996, 2, 54, 4.05e-18)).toBe('F(2, 54) = 92, p < 1e-16');
  });

  it('throws StatsInputError naming the problem', () => {
    expect(() => oneWayAnova([[1, 2, 3]])).toThrow(/at least two groups, got 1/);
    expect(() => oneWayAnova([{ label: 'L', values: [1, 2] }, { label: 'M', values: [] }])).toThrow(/group 'M' has no data/);
    expect(() => oneWayAnova([[1, 2], [3, Infinity]])).toThrow(/Infinity is not a finite number/);
    expect(() => oneWayAnova([[1, 2], [3, NaN]])).toThrow(StatsInputError);
    expect(() => oneWayAnova([[1], [2]])).toThrow(/zero residual degrees of freedom/);
    expect(() => oneWayAnova([['1.5', 'abc'], ['2', '3']])).toThrow(/'abc' is not a finite decimal number/);
  });
});
