import { describe, expect, it } from 'vitest';
import { analyse, ENGINE_VERSION } from './analyse';
import type { AnalysisRow } from './analysis-input';
import { StatsInputError } from './errors';
import { loadReference, relErr, type RDataset, type RTableRow } from './reference-data.spec-helper';
import type { AnovaEffectRow } from './types';

interface TukeyRef {
  comparison: string;
  diff: number;
  lwr: number;
  upr: number;
  pAdj: number;
}
const wb = loadReference<
  RDataset & {
    twoWay: { table: RTableRow[] };
    oneWayTension: { table: RTableRow[]; etaSquared: number; omegaSquared: number };
    tukeyHSDTwoWay: { terms: Record<string, TukeyRef[]> };
    leveneMeanCells: { f: number; p: number };
    brownForsytheMedianCells: { f: number; p: number };
    bartlettCells: { statistic: number; p: number };
    kruskalCells: { statistic: number; p: number };
    shapiroResidualsTwoWay: { W: number; p: number };
  }
>('r-datasets/warpbreaks.json');

const rows: AnalysisRow[] = wb.data.rows.map((r) => ({ factors: { wool: String(r[1]), tension: String(r[2]) }, value: String(r[0]) }));

describe('analyse', () => {
  it('two-way warpbreaks: table, notes, descriptives, plots, residuals', () => {
    // R 4.2.2 summary(aov(breaks ~ wool * tension)) (shared/reference/r-datasets/warpbreaks.json twoWay)
    const r = analyse({ rows, response: 'breaks', factors: ['wool', 'tension'] });
    expect(r.engineVersion).toBe(ENGINE_VERSION);
    expect(r.terms).toEqual(['wool', 'tension', 'wool:tension']);
    wb.twoWay.table.slice(0, 3).forEach((ref, i) => {
      const row = r.anova[i] as AnovaEffectRow;
      expect(relErr(row.f, ref.f as number)).toBeLessThan(1e-11);
      expect(relErr(row.p, ref.p as number)).toBeLessThan(1e-11);
    });
    expect(r.anova[3]).toMatchObject({ source: 'Residual', df: 48 });
    expect(r.descriptives.byCell).toHaveLength(6);
    expect(r.plots.interactions).toHaveLength(1);
    expect(r.residuals).toHaveLength(54);
    expect(r.fitted[0]).toBeCloseTo(44.5555555555556, 12); // R cellSummary A:L mean
    expect(r.cautions.join(' ')).toMatch(/engineering judgement/);
  });

  it('one factor: eta squared, omega squared and the sentence', () => {
    // R 4.2.2 summary(aov(breaks ~ tension)) (warpbreaks.json oneWayTension)
    const r = analyse({ rows, response: 'breaks', factors: ['tension'] });
    expect(relErr(r.oneWay?.etaSq as number, wb.oneWayTension.etaSquared)).toBeLessThan(1e-12);
    expect(relErr(r.oneWay?.omegaSq as number, wb.oneWayTension.omegaSquared)).toBeLessThan(1e-12);
    expect(r.oneWay?.sentence).toBe('F(2, 51) = 7.206, p = 0.00175');
  });

  it('runs the requested tests over the cells and Shapiro–Wilk on the residuals', () => {
    // R 4.2.2 leveneMeanCells, brownForsytheMedianCells, bartlettCells, kruskalCells, shapiroResidualsTwoWay
    // and TukeyHSD(aov(breaks ~ wool * tension))$`wool:tension` (warpbreaks.json)
    const r = analyse({
      rows,
      response: 'breaks',
      factors: ['wool', 'tension'],
      tests: ['tukey', 'welch', 'levene', 'brown-forsythe', 'bartlett', 'kruskal', 'shapiro'],
    });
    const t = r.tests;
    expect(relErr(t.levene?.f as number, wb.leveneMeanCells.f)).toBeLessThan(1e-12);
    expect(relErr(t.levene?.p as number, wb.leveneMeanCells.p)).toBeLessThan(1e-11);
    expect(relErr(t.brownForsythe?.f as number, wb.brownForsytheMedianCells.f)).toBeLessThan(1e-12);
    expect(relErr(t.bartlett?.statistic as number, wb.bartlettCells.statistic)).toBeLessThan(1e-12);
    expect(relErr(t.bartlett?.p as number, wb.bartlettCells.p)).toBeLessThan(1e-11);
    expect(relErr(t.kruskal?.statistic as number, wb.kruskalCells.statistic)).toBeLessThan(1e-12);
    // Royston's algorithm: R and SciPy differ by 6e-11 in W and 3e-9 in p (shared/reference README)
    expect(relErr(t.shapiro?.w as number, wb.shapiroResidualsTwoWay.W)).toBeLessThan(1e-9);
    expect(relErr(t.shapiro?.p as number, wb.shapiroResidualsTwoWay.p)).toBeLessThan(1e-7);
    expect(t.welch?.df1).toBe(5);
    // Tukey over the 6 cells equals R's wool:tension comparisons (same pooled MSE, df 48); R's intervals use
    // qtukey, good to ~3e-7 at this df (README), hence 1e-5 on the limits and 1e-6 on p
    const ref = wb.tukeyHSDTwoWay.terms['wool:tension'];
    expect(t.tukey).toHaveLength(ref.length);
    for (const c of ref) {
      const [b, a] = c.comparison.split('-');
      const row = t.tukey?.find((x) => x.a === a && x.b === b);
      expect(row, c.comparison).toBeDefined();
      expect(relErr(row?.diff as number, c.diff)).toBeLessThan(1e-12);
      expect(relErr(row?.lower as number, c.lwr)).toBeLessThan(1e-5);
      expect(relErr(row?.upper as number, c.upr)).toBeLessThan(1e-5);
      expect(Math.abs((row?.p as number) - c.pAdj)).toBeLessThan(1e-6);
    }
  });

  it('reads exact decimals and says so (NIST StRD SmLs07 rows)', () => {
    // NIST StRD SmLs07 certified between-treatment F = 21.0 (shared/reference/nist-strd-anova/SmLs07.json)
    const nist = loadReference<{ groupsAsPrinted: string[][] }>('nist-strd-anova/SmLs07.json');
    const nistRows = nist.groupsAsPrinted.flatMap((g, i) => g.map((v) => ({ factors: { T: `t${i + 1}` }, value: v })));
    const r = analyse({ rows: nistRows, response: 'y', factors: ['T'] });
    expect(relErr((r.anova[0] as AnovaEffectRow).f, 21)).toBeLessThan(1e-10);
    expect(r.notes[0]).toMatch(/exact decimals relative to 1000000000000.4/);
    expect(r.descriptives.overall.mean).toBeCloseTo(1000000000000.4, 3);
  });

  it('adds the dispersion analysis of the cells when a goal is given', () => {
    // R 4.2.2 cell SDs of warpbreaks (warpbreaks.json cellSummary): A:L sd 18.0977285253641
    const r = analyse({ rows, response: 'breaks', factors: ['wool', 'tension'], dispersion: { kind: 'smaller' } });
    const al = r.dispersion?.cells.find((c) => c.key.wool === 'A' && c.key.tension === 'L');
    expect(relErr(al?.sd as number, 18.0977285253641)).toBeLessThan(1e-12);
    expect(relErr(al?.lnVariance as number, Math.log(18.0977285253641 ** 2))).toBeLessThan(1e-12);
  });

  it('no factor: residual row only, Shapiro–Wilk on the centred response', () => {
    // common practice, no source: intercept-only model, residual df N - 1
    const r = analyse({ rows, response: 'breaks', factors: [], tests: ['shapiro'] });
    expect(r.anova).toEqual([expect.objectContaining({ source: 'Residual', df: 53 })]);
    expect(r.tests.shapiro?.w).toBeGreaterThan(0);
  });

  it('bad input throws StatsInputError naming the value', () => {
    const bad = (over: Partial<Parameters<typeof analyse>[0]>): (() => unknown) => () =>
      analyse({ rows, response: 'breaks', factors: ['wool', 'tension'], ...over });
    expect(bad({ factors: ['wool', 'wool'] })).toThrow(/factor 'wool' is named twice/);
    expect(bad({ rows: rows.map((r) => ({ ...r, factors: { ...r.factors, wool: 'A' } })) })).toThrow(
      /factor 'wool' has fewer than two levels \(A\)/,
    );
    expect(bad({ levels: { wool: ['A', 'B', 'C'] } })).toThrow(/level 'C' of factor 'wool' has no data/);
    expect(bad({ rows: rows.map((r, i) => (i === 3 ? { ...r, value: 'NaN' } : r)) })).toThrow(/row 4: 'NaN'/);
    expect(bad({ rows: rows.map((r, i) => (i === 7 ? { ...r, value: Infinity } : r)) })).toThrow(/row 8: response Infinity/);
    expect(bad({ rows: rows.slice(0, 2), factors: ['tension'] })).toThrow(/fewer than two levels/);
    const two = [rows[0], rows[27]]; // A:L and B:L (R rows 1 and 28), one run each
    expect(() => analyse({ rows: two, response: 'breaks', factors: ['wool'] })).toThrow(/zero residual degrees of freedom/);
    expect(bad({ tests: ['anderson'] })).toThrow(/unknown test 'anderson'/);
    expect(bad({ factors: ['wool', 'tension'], terms: ['wool:speed'] })).toThrow(StatsInputError);
  });
});
