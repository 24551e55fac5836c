import { describe, expect, it } from 'vitest';
import { hillFromLankford } from './hill48';
import { yieldLocus } from './yield-locus';

describe('yieldLocus', () => {
  it('closes numerically and every point lies on its locus', () => {
    const c = hillFromLankford({ r0: 1.8, r45: 1.2, r90: 2.3 });
    const res = yieldLocus(c, 180);
    expect(res.hill).toHaveLength(181);
    expect(res.hill[180]).toEqual(res.hill[0]);
    expect(res.vonMises[180]).toEqual(res.vonMises[0]);
    for (const p of res.hill) {
      // Hill 1948 with τ = 0, normalised to the RD uniaxial yield stress: f(x, y) = G + H.
      expect((c.G + c.H) * p.s1 ** 2 - 2 * c.H * p.s1 * p.s2 + (c.H + c.F) * p.s2 ** 2).toBeCloseTo(c.G + c.H, 12);
    }
    for (const p of res.vonMises) expect(p.s1 ** 2 - p.s1 * p.s2 + p.s2 ** 2).toBeCloseTo(1, 12);
  });

  it('gives the von Mises pure-shear and equibiaxial points', () => {
    const res = yieldLocus({ F: 0.5, G: 0.5, H: 0.5, N: 1.5 }, 8);
    // von Mises: equibiaxial yield = uniaxial; pure shear σ1 = −σ2 = σ0/√3 (classical, from memory).
    expect(Math.hypot(res.vonMises[1].s1, res.vonMises[1].s2)).toBeCloseTo(Math.SQRT2, 14);
    expect(res.vonMises[7].s1).toBeCloseTo(1 / Math.sqrt(3), 14);
    expect(res.vonMises[7].s2).toBeCloseTo(-1 / Math.sqrt(3), 14);
    expect(res.hill[0].s1).toBeCloseTo(1, 15);
  });

  it.each([0.5, 1, 2, 3])('reproduces the normal-anisotropy ratios for r = %s', (r) => {
    // Hill 1948 normal anisotropy (Hosford & Caddell, Metal Forming, ch. on anisotropy; from memory):
    // equibiaxial σb/σ0 = √((1 + r)/2), plane strain σ1/σ0 = (1 + r)/√(1 + 2r).
    const res = yieldLocus(hillFromLankford({ r0: r, r45: r, r90: r }), 360);
    expect(res.keyPoints.equibiaxial).toBeCloseTo(Math.sqrt((1 + r) / 2), 13);
    expect(res.keyPoints.planeStrainRD.s1).toBeCloseTo((1 + r) / Math.sqrt(1 + 2 * r), 13);
    expect(res.keyPoints.uniaxialTD).toBeCloseTo(1, 14);
    // The sampled point at 45° is the equibiaxial one.
    expect(res.hill[45].s1).toBeCloseTo(Math.sqrt((1 + r) / 2), 12);
  });

  it('refuses a non-convex coefficient set and a too coarse sampling', () => {
    expect(() => yieldLocus({ F: -0.4, G: -0.4, H: 1.4, N: 1.5 })).toThrow(/not be closed and convex/);
    expect(() => yieldLocus({ F: 0.5, G: 0.5, H: 0.5, N: 1.5 }, 4)).toThrow(/pointCount = 4/);
  });
});
