import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { fUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';
import { noncentralFCdf, noncentralFTails, noncentralFUpperTail } from './noncentral-f.js';

interface PowerRow {
  k: number; n: number; f: number; df1: number; df2: number; ncp: number;
  fCritHighPrecision: number; powerHighPrecision: number; powerHighPrecision20: string; power: number;
}
// R 4.2.2 qf/pf + mpmath 1.3.0 at 40 digits (shared/reference/r-datasets/power-oneway.json)
const ref = JSON.parse(
  readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/power-oneway.json'), 'utf8'),
) as { rows: PowerRow[] };

const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

describe('noncentralFTails', () => {
  it('matches the 40-digit mpmath Poisson-mixture values to 1e-13 relative on all 27 rows', () => {
    // mpmath powerHighPrecision (power-oneway.json): the 20-digit string is parsed so the reference
    // itself carries no double rounding beyond 1e-16; 1e-13 leaves room for the ~1e-15 error of each
    // incomplete beta and of the Poisson weights. Measured worst: about 7e-15.
    let worst = 0;
    for (const r of ref.rows) {
      const got = noncentralFUpperTail(r.fCritHighPrecision, r.df1, r.df2, r.ncp);
      worst = Math.max(worst, rel(got, Number(r.powerHighPrecision20)));
    }
    expect(worst).toBeLessThan(1e-13);
  });

  it('agrees with R pf(..., ncp) to R\'s documented error bound (~1e-9)', () => {
    // R 4.2.2 1 - pf(fCrit, df1, df2, ncp) (power-oneway.json "power"); README: R's pf differs from
    // the high-precision values by up to 7e-10 absolute, so 1e-9 absolute is the right tolerance.
    for (const r of ref.rows) {
      expect(Math.abs(noncentralFUpperTail(r.fCritHighPrecision, r.df1, r.df2, r.ncp) - r.power)).toBeLessThan(1e-9);
    }
  });

  it('sums the lower and upper tails separately, and they add to one', () => {
    // probability axiom, no source needed; each tail is its own sum, so this is a real check
    for (const r of ref.rows) {
      const t = noncentralFTails(r.fCritHighPrecision, r.df1, r.df2, r.ncp);
      expect(Math.abs(t.lower + t.upper - 1)).toBeLessThan(1e-14);
      expect(noncentralFCdf(r.fCritHighPrecision, r.df1, r.df2, r.ncp)).toBe(t.lower);
    }
  });

  it('reduces to the central F upper tail when the noncentrality is 0', () => {
    // definition: λ = 0 is the central F; alpha = 0.05 at the mpmath critical value (power-oneway.json)
    const r = ref.rows[0];
    expect(rel(noncentralFUpperTail(r.fCritHighPrecision, r.df1, r.df2, 0), 0.05)).toBeLessThan(1e-14);
    expect(noncentralFUpperTail(3, 2, 10, 0)).toBe(fUpperTail(3, 2, 10));
  });

  it('keeps a tiny upper tail and a large noncentrality without underflow', () => {
    // For df1 = 2 the j = 0 term has the closed form P(F > f) = (1 + 2f/df2)^(-df2/2) (central F, df1 = 2);
    // with λ tiny the mixture must reproduce it to relative accuracy even at 1e-30.
    const f = 1e6;
    const exact = Math.pow(1 + (2 * f) / 10, -5);
    expect(rel(noncentralFUpperTail(f, 2, 10, 0), exact)).toBeLessThan(1e-12);
    // Large λ: the mean of the noncentral F is df2 (df1 + λ) / (df1 (df2 - 2)) (JKB vol. 2, eq. 30.4);
    // the median sits near it for λ = 4000, so the upper tail there is close to 1/2, not 0 or 1.
    const mean = (100 * (3 + 4000)) / (3 * 98);
    const p = noncentralFUpperTail(mean, 3, 100, 4000);
    expect(p).toBeGreaterThan(0.3);
    expect(p).toBeLessThan(0.7);
  });

  it('rejects bad arguments with StatsInputError naming the value', () => {
    expect(() => noncentralFUpperTail(1, 0, 10, 1)).toThrow(/df1.*0/);
    expect(() => noncentralFUpperTail(1, 2, -3, 1)).toThrow(/df2.*-3/);
    expect(() => noncentralFUpperTail(1, 2, 10, -1)).toThrow(StatsInputError);
    expect(() => noncentralFUpperTail(Number.NaN, 2, 10, 1)).toThrow(/NaN/);
  });
});
