import { describe, expect, it } from 'vitest';
import type { AngleResultDto, Hill48Result } from '../../../shared/calc';
import { angleOptions, DARK_PALETTE, LIGHT_PALETTE, locusOptions } from './chart-options';

type Series = { name: string; type: string; lineStyle?: { type?: string; color?: string }; symbol?: string; itemStyle?: { color?: string }; markArea?: { data: unknown[][] }; markLine?: { data: { yAxis: number }[] } };
const seriesOf = (o: unknown) => (o as { series: Series[] }).series;

const circle = Array.from({ length: 5 }, (_, i) => ({ s1: Math.cos((i * Math.PI) / 2), s2: Math.sin((i * Math.PI) / 2) }));
const locus: Hill48Result = {
  calcVersion: 'x',
  coefficients: { F: 0.5, G: 0.5, H: 0.5, N: 1.5 },
  lankford: null,
  locus: { hill: circle, vonMises: circle.map((p) => ({ s1: 1.2 * p.s1, s2: 1.2 * p.s2 })), keyPoints: { uniaxialTD: 1, equibiaxial: 1, planeStrainRD: { s1: 1.15, s2: 0.58 } }, normalisation: '' },
  freeNeck: null,
  freeNeckRefusal: null,
  assumptions: [],
  cautions: [],
};

describe('locusOptions', () => {
  it('draws Hill 1948 solid and von Mises dashed, on symmetric axes that hold both loci', () => {
    const o = locusOptions(locus, LIGHT_PALETTE) as { xAxis: { min: number; max: number }; yAxis: { min: number } };
    const [hill, mises, points] = seriesOf(o);
    expect(hill!.name).toBe('Hill 1948');
    expect(hill!.lineStyle?.type).toBeUndefined();
    expect(mises!.lineStyle?.type).toBe('dashed');
    expect(points!.symbol).toBe('diamond');
    expect(o.xAxis.min).toBe(-o.xAxis.max);
    expect(o.xAxis.max).toBeGreaterThanOrEqual(1.2);
    expect(o.yAxis.min).toBe(o.xAxis.min);
  });

  it('uses the lighter Okabe–Ito members in dark mode (Wong 2011 palette)', () => {
    expect(seriesOf(locusOptions(locus, DARK_PALETTE))[0]!.lineStyle?.color).toBe('#56B4E9');
    expect(seriesOf(locusOptions(locus, LIGHT_PALETTE))[0]!.lineStyle?.color).toBe('#0072B2');
  });
});

describe('angleOptions', () => {
  const curve = [20, 45, 35, 35, 35].map((a, i) => ({ fromFrame: i, toFrame: i + 1, angleDeg: a, relativeDisplacement: 0.02 * (i + 1), spansGap: false, status: i === 0 ? ('below-threshold' as const) : ('used' as const) }));
  const result = {
    units: { length: 'mm', frame: 'frame' },
    curve,
    maximum: { angleDeg: 45, fromFrame: 1, toFrame: 2, relativeDisplacement: 0.04 },
    plateau: { startFrame: 2, endFrame: 5, increments: 3, meanAngleDeg: 35, minAngleDeg: 35, maxAngleDeg: 35, relativeDisplacementFrom: 0.06, relativeDisplacementTo: 0.1 },
  } as unknown as AngleResultDto;

  it('marks the maximum with a triangle, the plateau with a band and its mean, and greys ignored increments', () => {
    const s = seriesOf(angleOptions(result, LIGHT_PALETTE));
    const main = s.find((x) => x.name === 'increment angle')!;
    expect(main.markLine?.data[0]!.yAxis).toBe(35);
    expect(main.markArea?.data).toHaveLength(1);
    expect(s.find((x) => x.name === 'early maximum')!.symbol).toBe('triangle');
    expect(s.find((x) => x.name === 'ignored (below threshold)')!.itemStyle?.color).toBe(LIGHT_PALETTE.inactive);
    const axis = (angleOptions(result, LIGHT_PALETTE) as { xAxis: { name: string } }).xAxis;
    expect(axis.name).toContain('(mm)');
  });

  it('leaves the plateau marks out when there is none', () => {
    const s = seriesOf(angleOptions({ ...result, plateau: null }, LIGHT_PALETTE));
    expect(s.find((x) => x.name === 'increment angle')!.markArea).toBeUndefined();
    expect(s.some((x) => x.name === 'plateau band')).toBe(false);
  });
});
