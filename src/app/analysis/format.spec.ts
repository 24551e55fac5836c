import { formatNumber, formatP, pPhrase } from './format';

describe('formatP', () => {
  it('reports p below double precision as a bound, as the engine documents (server/stats/types.ts)', () => {
    expect(formatP(1e-20)).toBe('< 1e-16');
    expect(pPhrase(1e-20)).toBe('p < 1e-16');
  });

  it('gives three significant digits otherwise', () => {
    // R 4.2.2 warpbreaks tension p = 0.000692620936713445 (warpbreaks.json twoWay.table)
    expect(formatP(0.000692620936713445)).toBe('0.000693');
    expect(pPhrase(0.0582129759595598)).toBe('p = 0.0582');
    expect(formatP(null)).toBe('—');
  });
});

describe('formatNumber', () => {
  it('rounds to four significant digits', () => {
    // R 4.2.2 warpbreaks residual MS 119.689814814815 (warpbreaks.json twoWay.table)
    expect(formatNumber(119.689814814815)).toBe('119.7');
    expect(formatNumber(0)).toBe('0');
    expect(formatNumber(Number.NaN)).toBe('—');
  });
});
