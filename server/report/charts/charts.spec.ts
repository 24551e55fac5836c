import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { LineSeriesOption, SeriesOption } from 'echarts';
import { analyse } from '../../stats/analyse.js';
import { renderSvg } from '../render-svg.js';
import { boxStats } from './distribution-plots.js';
import { buildCharts } from './index.js';
import { plottingPositions, qqPoints } from './residual-plots.js';

// The chart option builders on R's warpbreaks data: what each chart plots is checked against R's
// summaries (shared/reference/r-datasets/warpbreaks.json, R 4.2.2), not against the builder itself.

const ref = JSON.parse(readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/warpbreaks.json'), 'utf8')) as {
  data: { rows: [number, string, string][] };
  cellSummary: { level: string; n: number; mean: number; median: number }[];
  tensionSummary: { level: string; n: number; mean: number; median: number }[];
};
const runs = ref.data.rows.map(([b, w, t], i) => ({ settings: { W: w, T: t }, value: String(b), code: `R${i + 1}` }));
const result = analyse({ rows: runs.map((r) => ({ factors: r.settings, value: r.value })), response: 'breaks', factors: ['W', 'T'], tests: ['shapiro', 'levene'], levels: { W: ['A', 'B'], T: ['L', 'M', 'H'] } });
const charts = buildCharts({ result, terms: ['W', 'T', 'W:T'], runs, levels: { W: ['A', 'B'], T: ['L', 'M', 'H'] } });
const byId = new Map(charts.map((c) => [c.id, c]));

function lines(id: string): LineSeriesOption[] {
  return (byId.get(id)!.option.series as SeriesOption[]).filter((s): s is LineSeriesOption => s.type === 'line');
}
function yValues(s: LineSeriesOption): number[] {
  return (s.data as { value: [number, number] }[]).map((d) => d.value[1]);
}

describe('buildCharts', () => {
  it('draws one chart per main effect, the chosen interaction and its mirror, box plots and diagnostics', () => {
    expect(charts.map((c) => c.id)).toEqual(['main-effects:W', 'main-effects:T', 'interaction:W:T', 'interaction:T:W', 'box:W', 'box:T', 'residuals', 'qq', 'dispersion']);
  });

  it('interaction plot: one line per level of the series factor through the cell means', () => {
    const wt = lines('interaction:W:T');
    expect(wt.map((s) => s.name)).toEqual(['T = L', 'T = M', 'T = H']);
    // R 4.2.2 cell means (warpbreaks.json cellSummary): A:L 44.56, B:L 28.22, …
    const cell = (w: string, t: string) => ref.cellSummary.find((c) => c.level === `${w}:${t}`)!.mean;
    wt.forEach((s, i) => {
      const t = ['L', 'M', 'H'][i]!;
      yValues(s).forEach((y, j) => expect(y).toBeCloseTo(cell(['A', 'B'][j]!, t), 10));
    });
    const tw = lines('interaction:T:W');
    expect(tw.map((s) => s.name)).toEqual(['W = A', 'W = B']);
    expect(tw.map((s) => yValues(s).length)).toEqual([3, 3]);
    // the caption carries the pair's F and p (R: F = 4.189, p = 0.0210)
    expect(byId.get('interaction:W:T')!.caption).toContain('F(2, 48) = 4.189, p = 0.021');
  });

  it('main-effect plot: level means of tension as R gives them', () => {
    const [means] = lines('main-effects:T');
    // R 4.2.2 tension means 36.39, 26.39, 21.67 (warpbreaks.json tensionSummary)
    yValues(means!).forEach((y, i) => expect(y).toBeCloseTo(ref.tensionSummary[i]!.mean, 10));
  });

  it('box plots: medians per tension level as R gives them', () => {
    for (const s of ref.tensionSummary) {
      const values = ref.data.rows.filter((r) => r[2] === s.level).map((r) => r[0]);
      // R 4.2.2 median(breaks) by tension (warpbreaks.json tensionSummary)
      expect(boxStats({ level: s.level, values }).median).toBe(s.median);
    }
  });

  it('Q-Q plot: R\'s ppoints plotting positions and sorted residuals', () => {
    // (i - 3/8) / (n + 1/4) for n <= 10, as R's ppoints documents (from memory): n = 5
    expect(plottingPositions(5).map((p) => Number(p.toFixed(6)))).toEqual([0.119048, 0.309524, 0.5, 0.690476, 0.880952]);
    // (i - 1/2) / n for n > 10
    expect(plottingPositions(20)[0]).toBeCloseTo(0.025, 12);
    const pts = qqPoints(result.residuals, runs.map((r) => r.code));
    expect(pts.map((p) => p.sample)).toEqual([...result.residuals].sort((a, b) => a - b));
    expect(pts[27]!.theoretical).toBeCloseTo(-pts[26]!.theoretical, 12);
  });

  it('renders to standalone SVG on the server, legend and level names included', () => {
    const svg = renderSvg(byId.get('interaction:W:T')!.option);
    expect(svg.startsWith('<svg')).toBe(true);
    for (const label of ['T = L', 'T = M', 'T = H', '>A<', '>B<']) expect(svg).toContain(label);
  });
});
