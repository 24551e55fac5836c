import { describe, expect, it } from 'vitest';
import { parseDecimal, readDecimalResponses, readResponses } from './decimal-input';

describe('readDecimalResponses', () => {
  it('subtracts the first value exactly, so 13 shared digits are not lost', () => {
    // NIST StRD SmLs07 observations as printed (shared/reference/nist-strd-anova/SmLs07.json): the
    // differences 0.4 - 0.3 etc. are exact decimals, each rounded once to a double
    const r = readDecimalResponses(['1000000000000.4', '1000000000000.3', '1000000000000.5']);
    expect(Array.from(r.shifted)).toEqual([0, -0.1, 0.1]);
    expect(r.offsetText).toBe('1000000000000.4');
    // the plain double route cannot do this: (common practice, no source) ulp(1e12) = 1.2e-4
    expect(1000000000000.3 - 1000000000000.4).not.toBe(-0.1);
  });

  it('reads signs, exponents and mixed scales', () => {
    // exact decimal arithmetic: -1.5e3 - 2.25 = -1502.25 (common practice, no source)
    const r = readDecimalResponses(['2.25', '-1.5e3', '+0.75', '.5']);
    expect(Array.from(r.shifted)).toEqual([0, -1502.25, -1.5, -1.75]);
    expect(parseDecimal('  12.50 ')).toEqual({ mantissa: 1250n, exponent: -2 });
  });

  it('names the bad value', () => {
    expect(() => readDecimalResponses(['1', '', '3'])).toThrow(/run 2: '' is not a finite decimal number/);
    expect(() => readDecimalResponses(['1', '1,5'])).toThrow(/'1,5'/);
    expect(() => readDecimalResponses([1, NaN])).toThrow(/run 2: response NaN is not a finite number/);
    expect(() => readDecimalResponses(['Infinity'])).toThrow(/'Infinity'/);
  });
});

describe('readResponses', () => {
  it('keeps ordinary doubles as they are and re-reads doubles with shared leading digits', () => {
    // common practice, no source: magnitude/spread >= 1e3 means >= 3 shared leading digits
    expect(readResponses([1.5, 2.5]).offset).toBe(0);
    const r = readResponses([1000000.4, 1000000.3]);
    expect(r.offsetText).toBe('1000000.4');
    expect(r.shifted[1]).toBe(-0.1);
  });
});
