import { describe, expect, it } from 'vitest';
import { CalcInputError } from './errors';
import {
  assertHillAdmissible,
  hillEquivalentStress,
  hillFromLankford,
  hillYieldFunction,
  ISOTROPIC_HILL,
  lankfordFromHill,
  normaliseHill,
} from './hill48';
import { hillStrainRate, hillStressFromStrainRate } from './hill48-flow';
import { inFrame } from './plane-tensor';

// Triples spanning typical sheet values: mild/IF steel (r > 1), aluminium (r < 1), strongly planar anisotropic.
const TRIPLES = [
  { r0: 1, r45: 1, r90: 1 },
  { r0: 1.8, r45: 1.2, r90: 2.3 },
  { r0: 0.7, r45: 0.55, r90: 0.85 },
  { r0: 0.45, r45: 1.6, r90: 3.1 },
  { r0: 2.6, r45: 0.3, r90: 0.9 },
];

describe('hillFromLankford / lankfordFromHill', () => {
  it('gives the isotropic set F = G = H = 1/2, N = 3/2 for r = 1', () => {
    // Hill 1948: isotropy F = G = H, N = 3F; with G + H = 1 that is 1/2, 1/2, 1/2, 3/2.
    const c = hillFromLankford({ r0: 1, r45: 1, r90: 1 });
    expect(c.F).toBeCloseTo(0.5, 15);
    expect(c.G).toBeCloseTo(0.5, 15);
    expect(c.H).toBeCloseTo(0.5, 15);
    expect(c.N).toBeCloseTo(1.5, 15);
  });

  it.each(TRIPLES)('satisfies r0 = H/G, r90 = H/F, r45 = N/(F+G) − 1/2 and G + H = 1 for %o', (r) => {
    const c = hillFromLankford(r);
    // Hill 1948 r-value relations, evaluated directly rather than through lankfordFromHill.
    expect(c.H / c.G).toBeCloseTo(r.r0, 13);
    expect(c.H / c.F).toBeCloseTo(r.r90, 13);
    expect(c.N / (c.F + c.G) - 0.5).toBeCloseTo(r.r45, 13);
    expect(c.G + c.H).toBeCloseTo(1, 15);
    const back = lankfordFromHill(c);
    expect(back.r0).toBeCloseTo(r.r0, 13);
    expect(back.r45).toBeCloseTo(r.r45, 13);
    expect(back.r90).toBeCloseTo(r.r90, 13);
  });

  it.each(TRIPLES)('agrees with the flow rule: uniaxial tension at 0°, 45°, 90° reproduces r for %o', (r) => {
    // Definition of the Lankford coefficient (width / thickness plastic strain rate) applied to the
    // Hill 1948 flow rule through a frame rotation: checks flow rule and rotation, not the inversion.
    const c = hillFromLankford(r);
    const rAt = (deg: number): number => {
      const eMat = hillStrainRate(c, inFrame({ xx: 1, yy: 0, xy: 0 }, -deg));
      const eLoad = inFrame(eMat, deg);
      return eLoad.yy / -(eLoad.xx + eLoad.yy);
    };
    expect(rAt(0)).toBeCloseTo(r.r0, 12);
    expect(rAt(45)).toBeCloseTo(r.r45, 12);
    expect(rAt(90)).toBeCloseTo(r.r90, 12);
    // Hill 1948 off-axis r-value, r(α) = [H + (2N − F − G − 4H) sin²α cos²α] / (F sin²α + G cos²α) (from memory).
    const a = (30 * Math.PI) / 180;
    const s2 = Math.sin(a) ** 2;
    const c2 = Math.cos(a) ** 2;
    expect(rAt(30)).toBeCloseTo((c.H + (2 * c.N - c.F - c.G - 4 * c.H) * s2 * c2) / (c.F * s2 + c.G * c2), 12);
  });

  it('refuses non-positive or non-finite r and names the value', () => {
    expect(() => hillFromLankford({ r0: 0, r45: 1, r90: 1 })).toThrow(/r0 = 0 .*must be > 0/);
    expect(() => hillFromLankford({ r0: 1, r45: -0.2, r90: 1 })).toThrow(/r45 = -0.2/);
    expect(() => hillFromLankford({ r0: 1, r45: 1, r90: Number.NaN })).toThrow(CalcInputError);
    expect(() => lankfordFromHill({ F: 0.5, G: 0.5, H: 0.5, N: 0.4 })).toThrow(/N = 0.4 gives r45/);
  });
});

describe('yield function and normalisation', () => {
  it('reduces to von Mises for the isotropic set', () => {
    // von Mises plane stress: σ̄² = σ1² − σ1σ2 + σ2² + 3τ² (common practice, no source needed beyond any plasticity text).
    const s = { s11: 1.3, s22: -0.4, s12: 0.7 };
    expect(hillYieldFunction(ISOTROPIC_HILL, s)).toBeCloseTo(1.3 ** 2 + 1.3 * 0.4 + 0.4 ** 2 + 3 * 0.7 ** 2, 14);
    // Pure shear: von Mises equivalent stress √3 τ (from memory, classical).
    expect(hillEquivalentStress(ISOTROPIC_HILL, { s11: 0, s22: 0, s12: 1 })).toBeCloseTo(Math.sqrt(3), 14);
  });

  it('makes the equivalent stress equal the RD uniaxial stress for any scale', () => {
    const c = { F: 0.9, G: 0.6, H: 1.4, N: 3 };
    expect(hillEquivalentStress(c, { s11: 250, s22: 0, s12: 0 })).toBeCloseTo(250, 10);
    const n = normaliseHill(c);
    expect(n.G + n.H).toBeCloseTo(1, 15);
    expect(n.F / n.N).toBeCloseTo(c.F / c.N, 15);
  });

  it('inverts the flow rule', () => {
    const c = hillFromLankford({ r0: 1.8, r45: 1.2, r90: 2.3 });
    const s = { xx: 1.1, yy: -0.3, xy: 0.45 };
    const back = hillStressFromStrainRate(c, hillStrainRate(c, s));
    expect(back.xx).toBeCloseTo(s.xx, 13);
    expect(back.yy).toBeCloseTo(s.yy, 13);
    expect(back.xy).toBeCloseTo(s.xy, 13);
  });

  it('refuses coefficient sets whose quadratic form is not positive definite', () => {
    expect(() => assertHillAdmissible({ F: 0.5, G: -0.5, H: 0.25, N: 1.5 })).toThrow(/G \+ H = -0.25 /);
    // F = G = −0.5, H = 1.5: G + H = 1 > 0 but FG + GH + HF = 0.25 − 0.75 − 0.75 = −1.25 < 0 (hyperbolic locus).
    expect(() => assertHillAdmissible({ F: -0.5, G: -0.5, H: 1.5, N: 1.5 })).toThrow(/FG \+ GH \+ HF = -1.25 /);
    expect(() => assertHillAdmissible({ F: 0.5, G: 0.5, H: 0.5, N: 0 })).toThrow(/N = 0 is not > 0/);
    // Convex although F < 0 (det = −0.1·0.6 + 0.6·0.4 − 0.1·0.4 = 0.14 > 0): must pass.
    expect(() => assertHillAdmissible({ F: -0.1, G: 0.6, H: 0.4, N: 1 })).not.toThrow();
  });
});
