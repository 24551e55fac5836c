import { describe as suite, expect, it } from 'vitest';
import { buildCellTable } from './cell-stats';
import { describe } from './descriptives';
import { tUpperQuantile } from './distributions';
import { plotData } from './plot-data';
import { coded, loadReference, relErr, type RDataset } from './reference-data.spec-helper';

interface Summary {
  level: string;
  n: number;
  mean: number;
  sd: number;
}
const warpbreaks = loadReference<RDataset & { cellSummary: Summary[]; tensionSummary: Summary[] }>('r-datasets/warpbreaks.json');

suite('descriptives', () => {
  const { y, factors } = coded(warpbreaks, ['wool', 'tension'], 'breaks');
  const table = buildCellTable(y, factors);
  const d = describe(table, 0);

  it('per cell: n, mean and SD as R computes them, in standard order', () => {
    // R 4.2.2 aggregate(breaks ~ wool + tension, FUN = mean / sd) (warpbreaks.json cellSummary, 15 digits)
    expect(d.byCell.map((c) => c.label)).toEqual(warpbreaks.cellSummary.map((c) => c.level));
    d.byCell.forEach((c, i) => {
      const ref = warpbreaks.cellSummary[i];
      expect(c.n).toBe(ref.n);
      expect(relErr(c.mean, ref.mean)).toBeLessThan(1e-13);
      expect(relErr(c.sd as number, ref.sd)).toBeLessThan(1e-13);
      expect(relErr(c.variance as number, ref.sd ** 2)).toBeLessThan(1e-13);
      expect(relErr(c.cv as number, ref.sd / ref.mean)).toBeLessThan(1e-13);
    });
  });

  it('per level of tension, pooled from the cells', () => {
    // R 4.2.2 (warpbreaks.json tensionSummary)
    d.byLevel.tension.forEach((g, i) => {
      const ref = warpbreaks.tensionSummary[i];
      expect(g.label).toBe(ref.level);
      expect(relErr(g.mean, ref.mean)).toBeLessThan(1e-13);
      expect(relErr(g.sd as number, ref.sd)).toBeLessThan(1e-13);
    });
  });

  it('95 % CI of the mean is mean +- t(0.975, n - 1) sd / sqrt(n), with min and max', () => {
    // t.test(breaks[wool == "A" & tension == "L"])$conf.int, recomputed from R's mean/sd (cellSummary) and
    // qt(0.975, 8) = 2.306004135204166 (from memory; tables: 2.306)
    const ref = warpbreaks.cellSummary[0];
    const half = (2.306004135204166 * ref.sd) / 3;
    expect(relErr(tUpperQuantile(0.025, 8), 2.306004135204166)).toBeLessThan(1e-12);
    expect(relErr(d.byCell[0].ciLower as number, ref.mean - half)).toBeLessThan(1e-12);
    expect(relErr(d.byCell[0].ciUpper as number, ref.mean + half)).toBeLessThan(1e-12);
    // warpbreaks A:L raw values (R datasets, rows 1-9): 26 30 54 25 70 52 51 26 67
    expect(d.byCell[0].min).toBe(25);
    expect(d.byCell[0].max).toBe(70);
    expect(d.overall.n).toBe(54);
  });

  it('plot data carries the same means and CIs, and one series per level', () => {
    // R 4.2.2 cell and level means (warpbreaks.json cellSummary / tensionSummary)
    const p = plotData(table, 0);
    const tension = p.mainEffects.find((m) => m.factor === 'tension');
    expect(tension?.points.map((pt) => pt.x)).toEqual(['L', 'M', 'H']);
    expect(relErr(tension?.points[0].mean as number, warpbreaks.tensionSummary[0].mean)).toBeLessThan(1e-13);
    const inter = p.interactions[0];
    expect([inter.xFactor, inter.seriesFactor]).toEqual(['wool', 'tension']);
    expect(inter.points[0]).toMatchObject({ x: 'A', series: 'L', n: 9 });
    expect(inter.points[0].lower).toBe(d.byCell[0].ciLower);
  });
});
