import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { balancedMainEffects, dispersionAnalysis, type DispersionCellInput } from './dispersion.js';

// R 4.2.2 datasets::warpbreaks (shared/reference/r-datasets/warpbreaks.json)
interface FRef { f: number; df1: number; df2: number; p: number }
const wb = JSON.parse(readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/warpbreaks.json'), 'utf8')) as {
  data: { rows: [number, string, string][] };
  cellSummary: { level: string; n: number; mean: number; sd: number }[];
  twoWay: { table: { term: string; df: number; ss: number }[] };
  leveneMeanTension: FRef; brownForsytheMedianTension: FRef;
};
const rel = (got: number, want: number): number => Math.abs(got - want) / Math.abs(want);

function cellsOf(factors: ('wool' | 'tension')[]): DispersionCellInput[] {
  const map = new Map<string, DispersionCellInput>();
  for (const [y, wool, tension] of wb.data.rows) {
    const key: Record<string, string> = {};
    if (factors.includes('wool')) key.wool = wool;
    if (factors.includes('tension')) key.tension = tension;
    const id = JSON.stringify(key);
    if (!map.has(id)) map.set(id, { key, values: [] });
    map.get(id)?.values.push(y);
  }
  return [...map.values()];
}

describe('dispersionAnalysis', () => {
  it('gives R\'s cell means and SDs, and ln s² and CV from them', () => {
    // warpbreaks.json cellSummary (R tapply mean/sd), 15 digits -> 1e-13
    const result = dispersionAnalysis(cellsOf(['wool', 'tension']), ['wool', 'tension'], { kind: 'scatter' });
    for (const want of wb.cellSummary) {
      const [wool, tension] = want.level.split(':');
      const got = result.cells.find((c) => c.key.wool === wool && c.key.tension === tension);
      expect(got?.n).toBe(want.n);
      expect(rel(got?.mean as number, want.mean)).toBeLessThan(1e-13);
      expect(rel(got?.sd as number, want.sd)).toBeLessThan(1e-13);
      expect(rel(got?.lnVariance as number, Math.log(want.sd ** 2))).toBeLessThan(1e-13);
      expect(rel(got?.cv as number, want.sd / want.mean)).toBeLessThan(1e-13);
    }
  });

  it('reduces to Levene and Brown–Forsythe for one factor (R anova(lm(z ~ tension)))', () => {
    // warpbreaks.json leveneMeanTension / brownForsytheMedianTension, 1e-12
    const [t] = dispersionAnalysis(cellsOf(['tension']), ['tension'], { kind: 'scatter' }).varianceTests;
    expect(rel(t.levene?.f as number, wb.leveneMeanTension.f)).toBeLessThan(1e-12);
    expect(rel(t.levene?.p as number, wb.leveneMeanTension.p)).toBeLessThan(1e-12);
    expect(rel(t.brownForsythe?.f as number, wb.brownForsytheMedianTension.f)).toBeLessThan(1e-12);
  });

  it('computes the Taguchi S/N ratios from their definitions', () => {
    // Phadke 1989 (Quality Engineering Using Robust Design) ch. 6 definitions, from memory:
    // nominal 10 log10(ȳ²/s²), smaller -10 log10(mean y²), larger -10 log10(mean 1/y²).
    // For y = 9, 10, 11: ȳ = 10, s² = 1 -> 20 dB; mean y² = 302/3; mean 1/y² = (1/81 + 1/100 + 1/121)/3.
    const r = dispersionAnalysis(
      [{ key: { a: '1' }, values: [9, 10, 11] }, { key: { a: '2' }, values: [8, 10, 12] }],
      ['a'],
      { kind: 'nominal', target: 10 },
    );
    const sn = r.cells[0].signalToNoise;
    expect(sn.nominal).toBeCloseTo(20, 12);
    expect(sn.smaller).toBeCloseTo(-10 * Math.log10(302 / 3), 12);
    expect(sn.larger).toBeCloseTo(-10 * Math.log10((1 / 81 + 1 / 100 + 1 / 121) / 3), 12);
  });

  it('ranks on-target, low-scatter settings first and explains the rule', () => {
    // invented cells: same scatter, one on target; one on target with more scatter; one off target
    const cells = [
      { key: { w: 'wide' }, values: [11.9, 12.0, 12.1] }, // mean 12 (off by 2), s² 0.01 -> loss 4.01
      { key: { w: 'mid' }, values: [9.0, 10.0, 11.0] }, // on target, s² 1 -> loss 1
      { key: { w: 'narrow' }, values: [9.9, 10.0, 10.1] }, // on target, s² 0.01 -> loss 0.01
      { key: { w: 'single' }, values: [10] }, // no scatter estimate
    ];
    const r = dispersionAnalysis(cells, ['w'], { kind: 'nominal', target: 10 });
    expect(r.ranking.map((x) => [x.rank, x.key.w])).toEqual([[1, 'narrow'], [2, 'mid'], [3, 'wide'], [null, 'single']]);
    expect(r.ranking[0].loss).toBeCloseTo(0.01, 12);
    expect(r.rankingRule).toMatch(/target/);
    const smaller = dispersionAnalysis(cells, ['w'], { kind: 'smaller' });
    // mean y²: narrow (98.01 + 100 + 102.01)/3 = 100.0067 < mid 302/3 = 100.667 < wide 144.0067
    expect(smaller.ranking.slice(0, 3).map((x) => x.key.w)).toEqual(['narrow', 'mid', 'wide']);
    expect(dispersionAnalysis(cells, ['w'], { kind: 'scatter' }).ranking[2].key.w).toBe('mid');
  });

  it('fits main effects of ln s² over complete cells, and per-level means', () => {
    const r = dispersionAnalysis(cellsOf(['wool', 'tension']), ['wool', 'tension'], { kind: 'scatter' });
    expect(r.lnVarianceAnova?.map((x) => [x.source, x.df])).toEqual([['wool', 1], ['tension', 2], ['Residual', 2]]);
    // the three SS add up to the total SS of the six ln s² values (balanced, orthogonal)
    const ln = r.cells.map((c) => c.lnVariance as number);
    const m = ln.reduce((a, b) => a + b, 0) / 6;
    const total = ln.reduce((s, v) => s + (v - m) ** 2, 0);
    expect(r.lnVarianceAnova?.reduce((s, x) => s + x.ss, 0)).toBeCloseTo(total, 12);
    const lowTension = r.levels.find((l) => l.factor === 'tension' && l.level === 'L');
    expect(lowTension?.meanLnVariance).toBeCloseTo((Math.log(18.0977285253641 ** 2) + Math.log(9.85872428078017 ** 2)) / 2, 10);
  });

  it('notes when ln s² cannot be fitted here (incomplete cells)', () => {
    const cells = cellsOf(['wool', 'tension']).slice(0, 5);
    const r = dispersionAnalysis(cells, ['wool', 'tension'], { kind: 'scatter' });
    expect(r.lnVarianceAnova).toBeNull();
    expect(r.notes.join(' ')).toMatch(/linear model/);
  });

  it('rejects missing levels, duplicate cells, empty cells, NaN and repeated factors', () => {
    const ok = { key: { a: '1' }, values: [1, 2] };
    expect(() => dispersionAnalysis([ok, { key: {}, values: [1, 2] }], ['a'], { kind: 'scatter' })).toThrow(/no level for factor "a"/);
    expect(() => dispersionAnalysis([ok, ok], ['a'], { kind: 'scatter' })).toThrow(/appears twice/);
    expect(() => dispersionAnalysis([ok, { key: { a: '2' }, values: [] }], ['a'], { kind: 'scatter' })).toThrow(/no values/);
    expect(() => dispersionAnalysis([ok, { key: { a: '2' }, values: [Number.NaN] }], ['a'], { kind: 'scatter' })).toThrow(/NaN/);
    expect(() => dispersionAnalysis([ok, { key: { a: '2' }, values: [1, 3] }], ['a', 'a'], { kind: 'scatter' })).toThrow(/named twice/);
    expect(() => dispersionAnalysis([ok, { key: { a: '2' }, values: [1, 3] }], ['a'], { kind: 'nominal', target: Number.NaN })).toThrow(/target/);
  });
});

describe('balancedMainEffects', () => {
  it('reproduces R\'s main-effect sums of squares for balanced warpbreaks', () => {
    // R 4.2.2 summary(aov(breaks ~ wool * tension)): balanced, so SS(wool) and SS(tension) do not
    // depend on the other terms; the main-effects residual pools interaction and error: df 2 + 48
    const rows = wb.data.rows.map(([value, wool, tension]) => ({ key: { wool, tension }, value }));
    const table = balancedMainEffects(rows, ['wool', 'tension']);
    const want = (term: string) => wb.twoWay.table.find((t) => t.term === term) as { df: number; ss: number };
    expect(rel(table?.[0].ss as number, want('wool').ss)).toBeLessThan(1e-12);
    expect(rel(table?.[1].ss as number, want('tension').ss)).toBeLessThan(1e-12);
    expect(table?.[2].df).toBe(50);
    expect(rel(table?.[2].ss as number, want('wool:tension').ss + want('Residuals').ss)).toBeLessThan(1e-12);
  });

  it('returns null for unbalanced data', () => {
    const rows = wb.data.rows.slice(1).map(([value, wool, tension]) => ({ key: { wool, tension }, value }));
    expect(balancedMainEffects(rows, ['wool', 'tension'])).toBeNull();
  });
});
