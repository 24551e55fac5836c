import { describe, expect, it } from 'vitest';
import { analyse } from './analyse';
import { loadReference, relErr, type RDataset } from './reference-data.spec-helper';

interface TukeyRef {
  comparison: string;
  diff: number;
  lwr: number;
  upr: number;
  pAdj: number;
}

// R's TukeyHSD intervals use qtukey, documented to about 3e-7 at df >= 10 (shared/reference README,
// studentized-range section): hence 1e-5 relative on the limits. Its adjusted p comes from ptukey
// (~1e-9 here), and p below ~1e-9 is only good to ~1e-12 absolute (computed as 1 - cdf).
function expectMatches(got: { a: string; b: string; diff: number; lower: number; upper: number; p: number }[] | undefined, ref: TukeyRef[]) {
  expect(got).toHaveLength(ref.length);
  for (const c of ref) {
    const [b, a] = c.comparison.split('-');
    const row = got?.find((x) => x.a === a && x.b === b);
    expect(row, c.comparison).toBeDefined();
    expect(relErr(row!.diff, c.diff)).toBeLessThan(1e-12);
    expect(relErr(row!.lower, c.lwr)).toBeLessThan(1e-5);
    expect(relErr(row!.upper, c.upr)).toBeLessThan(1e-5);
    expect(Math.abs(row!.p - c.pAdj)).toBeLessThan(Math.max(1e-12, 1e-6 * c.pAdj));
  }
}

describe('Tukey HSD per model term (model residual MS)', () => {
  it('warpbreaks: every term of breaks ~ wool * tension', () => {
    // R 4.2.2 TukeyHSD(aov(breaks ~ wool * tension, data = warpbreaks)) (shared/reference/r-datasets/warpbreaks.json tukeyHSDTwoWay)
    const wb = loadReference<RDataset & { tukeyHSDTwoWay: { terms: Record<string, TukeyRef[]> } }>('r-datasets/warpbreaks.json');
    const rows = wb.data.rows.map((r) => ({ factors: { wool: String(r[1]), tension: String(r[2]) }, value: String(r[0]) }));
    const res = analyse({ rows, response: 'breaks', factors: ['wool', 'tension'], tests: ['tukey'] });
    expect(res.posthoc?.map((p) => p.term)).toEqual(['wool', 'tension', 'wool:tension']);
    for (const term of res.posthoc!) expectMatches(term.comparisons, wb.tukeyHSDTwoWay.terms[term.term]!);
  });

  it('ToothGrowth: dose comparisons use the two-way residual MS (df 54), not the one-way pooled MS', () => {
    // R 4.2.2 TukeyHSD(aov(len ~ supp * factor(dose)), which = "factor(dose)") (shared/reference/r-datasets/ToothGrowth.json)
    const tg = loadReference<RDataset & { tukeyHSDDoseFromTwoWay: { comparisons: TukeyRef[] }; tukeyHSDDoseOneWay: { comparisons: TukeyRef[] } }>(
      'r-datasets/ToothGrowth.json',
    );
    const rows = tg.data.rows.map((r) => ({ factors: { supp: String(r[1]), dose: String(r[2]) }, value: String(r[0]) }));
    const res = analyse({ rows, response: 'len', factors: ['supp', 'dose'], tests: ['tukey'] });
    const dose = res.posthoc!.find((p) => p.term === 'dose')!;
    expectMatches(dose.comparisons, tg.tukeyHSDDoseFromTwoWay.comparisons);
    // and it is not the one-way interval (df 57): the widths differ
    const oneWay = tg.tukeyHSDDoseOneWay.comparisons[0]!;
    expect(Math.abs(dose.comparisons[0]!.upper - dose.comparisons[0]!.lower - (oneWay.upr - oneWay.lwr))).toBeGreaterThan(0.01);
  });

  it('is absent unless Tukey is asked for', () => {
    const rows = ['1.1', '1.3', '2.0', '2.4', '3.1', '2.9'].map((v, i) => ({ factors: { A: `a${i % 3}` }, value: v }));
    expect(analyse({ rows, response: 'y', factors: ['A'] }).posthoc).toBeUndefined();
  });
});
