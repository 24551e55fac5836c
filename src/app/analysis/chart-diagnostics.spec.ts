import type { ScatterSeriesOption } from 'echarts/charts';
import { boxStats, dispersionOption, qqOption, residualsOption } from './chart-diagnostics';
import { seriesOf } from './chart-kit';
import { chartTheme } from './chart-theme';

const theme = chartTheme(false);

describe('boxStats', () => {
  it('matches linear-interpolation quartiles', () => {
    // warpbreaks wool A, tension L runs (shared/reference/r-datasets/warpbreaks.json data.rows);
    // NumPy 2.4.6 np.percentile(x, [25, 50, 75]) = 26, 51, 54 (R quantile type 7 is the same method)
    const { box, outliers } = boxStats([26, 30, 54, 25, 70, 52, 51, 26, 67]);
    expect(box.slice(1, 4)).toEqual([26, 51, 54]);
    // 1.5 IQR = 42: every run lies within [-16, 96], so whiskers reach min and max
    expect(box[0]).toBe(25);
    expect(box[4]).toBe(70);
    expect(outliers).toEqual([]);
  });

  it('stops the whisker at the last run within 1.5 IQR and lists the rest as outliers', () => {
    // NumPy 2.4.6 np.percentile([1, 2, 3, 4, 100], [25, 50, 75]) = 2, 3, 4; 1.5 IQR = 3 (common practice, Tukey's rule)
    const { box, outliers } = boxStats([1, 2, 3, 4, 100]);
    expect(box).toEqual([1, 2, 3, 4, 4]);
    expect(outliers).toEqual([100]);
  });

  it('names the problem for an empty level', () => {
    expect(() => boxStats([])).toThrow(/empty/);
  });
});

describe('qqOption', () => {
  it('places residuals at normal scores (i - 3/8) / (n + 1/4)', () => {
    const option = qqOption([0.3, -1.2, 0.1, 2.0, -0.4], theme);
    const points = seriesOf(option).find((s): s is ScatterSeriesOption => s.id === 'qq-points');
    const data = points?.data as [number, number][];
    // SciPy 1.17.1 norm.ppf((i - 0.375) / 5.25), i = 1..5
    const expected = [-1.1797611176118612, -0.49720057068155404, 0, 0.49720057068155404, 1.1797611176118612];
    data.forEach(([z], i) => expect(z).toBeCloseTo(expected[i], 6));
    expect(data.map((d) => d[1])).toEqual([-1.2, -0.4, 0.1, 0.3, 2.0]);
  });

  it('refuses fewer than three residuals, saying how many it got', () => {
    expect(() => qqOption([1, 2], theme)).toThrow(/got 2/);
  });
});

describe('residualsOption', () => {
  it('plots one point per run and names mismatched inputs', () => {
    const option = residualsOption([1, 2, 3], [0.1, -0.2, 0.1], ['R1', 'R2', 'R3'], 0.2, theme);
    expect((seriesOf(option)[0].data as unknown[]).length).toBe(3);
    expect(() => residualsOption([1, 2], [0.1], ['R1'], 0.1, theme)).toThrow(/fitted has 2 values but residuals has 1/);
  });
});

describe('dispersionOption', () => {
  it('orders settings from most to least scatter along the category axis and leaves out single runs', () => {
    // SDs from warpbreaks.json cellSummary (R 4.2.2): A:L 18.10, B:H 4.89
    const option = dispersionOption(
      [
        { label: 'A:L', n: 9, mean: 44.56, sd: 18.0977285253641 },
        { label: 'B:H', n: 9, mean: 18.78, sd: 4.89330608530107 },
        { label: 'C:X', n: 1, mean: 20, sd: null },
      ],
      'lnVariance',
      theme,
    );
    const axis = option.yAxis as { data: string[] };
    expect(axis.data).toEqual(['A:L', 'B:H']);
    const dots = seriesOf(option).find((s) => s.id === 'spread');
    // ln(18.0977^2) = 5.7924 (common practice: ln s² = 2 ln s)
    expect((dots?.data as [number, number][])[0][0]).toBeCloseTo(2 * Math.log(18.0977285253641), 10);
    expect(seriesOf(option).some((s) => s.id === 'stem')).toBe(false);
  });
});
