import { describe, expect, it } from 'vitest';
import { oneWayAnova } from './anova-one-way';
import { fitLinearModel } from './linear-model';
import { loadReference, lre, NIST_SETS, type NistSet } from './reference-data.spec-helper';

// NIST StRD one-way ANOVA, all 11 data sets with certified values
// (shared/reference/nist-strd-anova/<Name>.json, public domain, https://www.itl.nist.gov/div898/strd/anova/anova.html).
const sets = NIST_SETS.map((name) => ({ name, ...loadReference<NistSet>(`nist-strd-anova/${name}.json`) }));

function lres(r: ReturnType<typeof oneWayAnova>, c: NistSet['certified']): number[] {
  return [
    lre(r.effect.ss, c.between.ss),
    lre(r.effect.ms, c.between.ms),
    lre(r.effect.f, c.between.f),
    lre(r.residual.ss, c.within.ss),
    lre(r.residual.ms, c.within.ms),
  ];
}

describe('NIST StRD ANOVA', () => {
  it.each(sets)('$name ($difficulty): LRE >= 10 for SS, MS and F from the printed decimals', (set) => {
    // certified values of the NIST file; input: groupsAsPrinted, the exact strings of the .dat file
    const r = oneWayAnova(set.groupsAsPrinted);
    expect(r.effect.df).toBe(set.certified.between.df);
    expect(r.residual.df).toBe(set.certified.within.df);
    for (const v of lres(r, set.certified)) expect(v).toBeGreaterThanOrEqual(10);
  });

  it.each(sets.filter((s) => s.difficulty !== 'higher'))('$name ($difficulty): LRE >= 10 from doubles', (set) => {
    // certified values of the NIST file; input: the JSON numbers (IEEE doubles)
    const r = oneWayAnova(set.groups);
    for (const v of lres(r, set.certified)) expect(v).toBeGreaterThanOrEqual(10);
  });

  it.each(sets)('$name: the double arithmetic itself is exact to >= 13 digits (least-squares path, no decimal re-reading)', (set) => {
    // exactFromBinary64Inputs: exact rational ANOVA of the doubles nearest the printed values (same JSON);
    // this isolates the engine's rounding from the rounding of the inputs.
    const y = Float64Array.from(set.groups.flat());
    const codes = Int32Array.from(set.groups.flatMap((g, i) => g.map(() => i)));
    const levels = set.groups.map((_, i) => `g${i + 1}`);
    const fit = fitLinearModel({ y, factors: [{ name: 'g', levels, codes }], terms: ['g'], ssType: 1 });
    const effect = fit.anova[0];
    const residual = fit.anova[1];
    const e = set.exactFromBinary64Inputs;
    expect(lre(effect.ss, e.between.ss)).toBeGreaterThanOrEqual(13);
    expect(lre(residual.ss, e.within.ss)).toBeGreaterThanOrEqual(13);
    expect('f' in effect && lre(effect.f, e.between.f)).toBeGreaterThanOrEqual(13);
  });
});
