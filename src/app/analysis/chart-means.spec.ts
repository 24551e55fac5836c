import type { LineSeriesOption } from 'echarts/charts';
import { seriesOf } from './chart-kit';
import { interactionOption, mainEffectsOption, mirrored } from './chart-means';
import { chartTheme } from './chart-theme';
import { WARPBREAKS_POINTS } from './warpbreaks-fixture';

const light = chartTheme(false);
const wb = { xFactor: 'tension', seriesFactor: 'wool', xLabel: 'Tension', seriesLabel: 'Wool', points: WARPBREAKS_POINTS };

function lines(option: ReturnType<typeof interactionOption>): LineSeriesOption[] {
  return seriesOf(option).filter((s): s is LineSeriesOption => s.type === 'line');
}

describe('interactionOption', () => {
  it('draws one line per level of the line factor, with one point per level of the axis factor', () => {
    // warpbreaks: wool has 2 levels, tension 3 (shared/reference/r-datasets/warpbreaks.json factorLevels)
    const ls = lines(interactionOption(wb, 'breaks', light));
    expect(ls.map((l) => l.id)).toEqual(['line:A', 'line:B']);
    expect(ls.map((l) => (l.data as unknown[]).length)).toEqual([3, 3]);
  });

  it('puts the cell means on the lines, in axis order, nudged sideways by less than half a level', () => {
    const [a, b] = lines(interactionOption(wb, 'breaks', light));
    const ys = (l: LineSeriesOption) => (l.data as [number, number][]).map((d) => d[1]);
    const xs = (l: LineSeriesOption) => (l.data as [number, number][]).map((d) => d[0]);
    // R 4.2.2 cell means (warpbreaks.json cellSummary): A:L 44.56, A:M 24, A:H 24.56; B:L 28.22, B:M 28.78, B:H 18.78
    expect(ys(a)).toEqual([44.5555555555556, 24, 24.5555555555556]);
    expect(ys(b)).toEqual([28.2222222222222, 28.7777777777778, 18.7777777777778]);
    xs(a).forEach((x, i) => expect(Math.abs(x - i)).toBeLessThan(0.5));
    expect(xs(a)[0]).not.toBe(xs(b)[0]);
  });

  it('draws a CI capsule per point that has a CI and none for a point from one run', () => {
    const points = WARPBREAKS_POINTS.map((p, i) => (i === 0 ? { ...p, n: 1, lower: null, upper: null } : p));
    const capsules = seriesOf(interactionOption({ ...wb, points }, 'breaks', light)).filter((s) => s.type === 'custom');
    expect(capsules.map((c) => (c.data as unknown[]).length)).toEqual([2, 3]);
  });

  it('gives every line its own marker shape, not only its own colour', () => {
    const ls = lines(interactionOption(wb, 'breaks', light));
    expect(new Set(ls.map((l) => l.symbol)).size).toBe(2);
  });

  it('labels the axis at the level positions only, and lists only the lines in the legend', () => {
    const option = interactionOption(wb, 'breaks', light);
    const axis = option.xAxis as { axisLabel: { customValues: number[]; formatter: (v: number) => string } };
    expect(axis.axisLabel.customValues).toEqual([0, 1, 2]);
    expect(axis.axisLabel.customValues.map((v) => axis.axisLabel.formatter(v))).toEqual(['L', 'M', 'H']);
    const legend = option.legend as { data: string[] };
    expect(legend.data).toEqual(['Wool = A', 'Wool = B']);
  });

  it('mirrors the roles: three lines (tension) of two points (wool)', () => {
    const ls = lines(interactionOption(mirrored(wb), 'breaks', light));
    expect(ls.map((l) => l.id)).toEqual(['line:L', 'line:M', 'line:H']);
    expect(ls.map((l) => (l.data as unknown[]).length)).toEqual([2, 2, 2]);
    // same cell A:L, now on the line for L at wool A (warpbreaks.json cellSummary)
    expect((ls[0].data as [number, number][])[0][1]).toBe(44.5555555555556);
  });
});

describe('mainEffectsOption', () => {
  it('draws one panel and one profile per factor on a shared scale, with the overall mean as reference', () => {
    // warpbreaks grand mean 28.1481 = 1520 / 54 (R mean(warpbreaks$breaks), from memory)
    const option = mainEffectsOption(
      [
        { factor: 'wool', label: 'Wool', points: [{ x: 'A', n: 27, mean: 31.037, lower: 26, upper: 36 }, { x: 'B', n: 27, mean: 25.2593, lower: 22, upper: 28.5 }] },
        { factor: 'tension', label: 'Tension', points: [{ x: 'L', n: 18, mean: 36.3889, lower: 30, upper: 42 }, { x: 'M', n: 18, mean: 26.3889, lower: 22, upper: 30 }, { x: 'H', n: 18, mean: 21.6667, lower: 18, upper: 25 }] },
      ],
      1520 / 54,
      'breaks',
      light,
    );
    const ls = seriesOf(option).filter((s): s is LineSeriesOption => s.type === 'line');
    expect(ls.map((l) => (l.data as unknown[]).length)).toEqual([2, 3]);
    expect(ls[0].markLine?.data).toEqual([{ yAxis: 1520 / 54 }]);
    const yAxes = option.yAxis as { min: number; max: number }[];
    expect(yAxes[0].min).toBe(yAxes[1].min);
    expect(yAxes[0].max).toBeGreaterThan(42);
  });
});

describe('chartTheme', () => {
  it('uses the Okabe–Ito colours in both modes, with a first colour that suits the background', () => {
    // Okabe & Ito 2008 palette, from memory: #E69F00 #56B4E9 #009E73 #F0E442 #0072B2 #D55E00 #CC79A7
    const okabeIto = ['#E69F00', '#56B4E9', '#009E73', '#F0E442', '#0072B2', '#D55E00', '#CC79A7'];
    const dark = chartTheme(true);
    expect([...light.series].sort()).toEqual([...okabeIto].sort());
    expect([...dark.series].sort()).toEqual([...okabeIto].sort());
    expect(light.series[0]).toBe('#0072B2');
    expect(dark.series[0]).not.toBe('#0072B2');
    expect(dark.text).not.toBe(light.text);
  });
});
