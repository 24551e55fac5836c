import { describe, expect, it } from 'vitest';
import { CalcInputError } from './errors';
import { hillFromLankford, ISOTROPIC_HILL, type LankfordValues } from './hill48';
import { predictRelativeDisplacementAngle } from './neck-angle';
import { solveHFromAngle, solveNormalAnisotropyFromAngle } from './neck-angle-inverse';

const DEG = 180 / Math.PI;
// Hill 1952: isotropic free neck at arctan √2, relative displacement at 90° − ψ.
const PSI_ISO = Math.atan(Math.SQRT2) * DEG;

const TRIPLES: LankfordValues[] = [
  { r0: 1, r45: 1, r90: 1 },
  { r0: 1.8, r45: 1.2, r90: 2.3 },
  { r0: 0.7, r45: 0.55, r90: 0.85 },
  { r0: 0.45, r45: 1.6, r90: 3.1 },
  { r0: 2.6, r45: 0.3, r90: 0.9 },
];

describe('solveHFromAngle (F, G, N given)', () => {
  it('recovers the isotropic H = 1/2 at the Hill 1952 free-neck pair (54.74°, 35.26°)', () => {
    const s = solveHFromAngle({ neckAngleDeg: PSI_ISO, relativeDisplacementAngleDeg: 90 - PSI_ISO }, { F: 0.5, G: 0.5, N: 1.5 });
    expect(s.H).toBeCloseTo(0.5, 12);
    expect(s.lankford?.r0).toBeCloseTo(1, 12);
  });

  it('inverts the forward relation to 1e-12 over a grid of neck angles, load angles and coefficients', () => {
    // Forward/inverse consistency (issue 7 check): predict φ from F, G, H, N, then solve H back.
    let checked = 0;
    let degenerate = 0;
    for (const r of TRIPLES) {
      const c = hillFromLankford(r);
      for (const alpha of [0, 15, 45, 80]) {
        for (const theta of [30, 40, 50, PSI_ISO, 60, 70, 80, 100, 125, 150]) {
          if (alpha === 0 && theta === 90) continue;
          let phi: number;
          try {
            phi = predictRelativeDisplacementAngle(c, theta, alpha).relativeDisplacementAngleDeg;
          } catch (e) {
            // Expected for (θ, coefficients) where the band would thicken; those have no φ to invert.
            if (e instanceof CalcInputError) continue;
            throw e;
          }
          const measured = { neckAngleDeg: theta, relativeDisplacementAngleDeg: phi, loadAngleDeg: alpha };
          let s: ReturnType<typeof solveHFromAngle>;
          try {
            s = solveHFromAngle(measured, c);
          } catch (e) {
            // Expected only where φ is truly insensitive to H; confirm that by perturbing H forward.
            if (!(e instanceof CalcInputError) || !/does not depend on H/.test(e.message)) throw e;
            const other = predictRelativeDisplacementAngle({ ...c, H: 3 * c.H }, theta, alpha).relativeDisplacementAngleDeg;
            expect(other).toBeCloseTo(phi, 9);
            degenerate++;
            continue;
          }
          expect(Math.abs(s.H - c.H)).toBeLessThan(1e-12);
          expect(s.admissibleAngleRangeDeg[0]).toBeLessThan(phi);
          expect(s.admissibleAngleRangeDeg[1]).toBeGreaterThan(phi);
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(150);
    expect(degenerate).toBeLessThan(5);
  });

  it('matches the hand-derived load-along-RD closed form for H (NECK-THEORY.md §5)', () => {
    // H = [FG·T(1 − PT) − 2NPG] / [(F + G)·T(PT − 1) + 2N(P − T)], T = tan θ, P = tan φ, derived by hand
    // from tan φ = T(D + 2NH)/(D T² + 2N(G + H)); an algebraic route independent of the module's.
    const F = 0.41;
    const G = 0.37;
    const N = 1.3;
    for (const [theta, phi] of [[50, 30], [65, 38], [80, 25]]) {
      const T = Math.tan(theta / DEG);
      const P = Math.tan(phi / DEG);
      const expected = (F * G * T * (1 - P * T) - 2 * N * P * G) / ((F + G) * T * (P * T - 1) + 2 * N * (P - T));
      expect(solveHFromAngle({ neckAngleDeg: theta, relativeDisplacementAngleDeg: phi }, { F, G, N }).H).toBeCloseTo(expected, 12);
    }
  });

  it('works on an un-normalised scale and reports the G + H = 1 set', () => {
    const c = hillFromLankford({ r0: 1.8, r45: 1.2, r90: 2.3 });
    const k = 3.7;
    const phi = predictRelativeDisplacementAngle(c, 65, 0).relativeDisplacementAngleDeg;
    const s = solveHFromAngle({ neckAngleDeg: 65, relativeDisplacementAngleDeg: phi }, { F: k * c.F, G: k * c.G, N: k * c.N });
    expect(s.H / k).toBeCloseTo(c.H, 12);
    expect(s.normalised.G + s.normalised.H).toBeCloseTo(1, 14);
    expect(s.lankford?.r0).toBeCloseTo(1.8, 11);
  });

  it('refuses an angle that no positive H produces and states the admissible range', () => {
    // Isotropic F, G, N at θ = 60°: the range of φ over H in (0, ∞) is bounded; 5° lies outside it.
    const call = (): unknown => solveHFromAngle({ neckAngleDeg: 60, relativeDisplacementAngleDeg: 5 }, { F: 0.5, G: 0.5, N: 1.5 });
    expect(call).toThrow(/relativeDisplacementAngleDeg = 5° admits no positive H .*positive H with a thinning neck gives φ between \d+\.\d{3}° and \d+\.\d{3}°/);
    expect(() => solveHFromAngle({ neckAngleDeg: 60, relativeDisplacementAngleDeg: 59 }, { F: 0.5, G: 0.5, N: 1.5 })).toThrow(/admits no positive H/);
  });

  it('refuses a neck perpendicular to an RD load (φ = 0 whatever H), bad angles and bad coefficients', () => {
    expect(() => solveHFromAngle({ neckAngleDeg: 90, relativeDisplacementAngleDeg: 0 }, ISOTROPIC_HILL)).toThrow(/does not depend on H/);
    expect(() => solveHFromAngle({ neckAngleDeg: 60, relativeDisplacementAngleDeg: 95 }, ISOTROPIC_HILL)).toThrow(
      /relativeDisplacementAngleDeg = 95° is outside \(-90°, 90°\)/,
    );
    expect(() => solveHFromAngle({ neckAngleDeg: -10, relativeDisplacementAngleDeg: 5 }, ISOTROPIC_HILL)).toThrow(/neckAngleDeg = -10°/);
    expect(() => solveHFromAngle({ neckAngleDeg: 60, relativeDisplacementAngleDeg: 30 }, { F: 0.5, G: 0, N: 1.5 })).toThrow(/G = 0/);
  });
});

describe('solveNormalAnisotropyFromAngle', () => {
  it('recovers r = 1 at the Hill 1952 isotropic pair', () => {
    const s = solveNormalAnisotropyFromAngle({ neckAngleDeg: PSI_ISO, relativeDisplacementAngleDeg: 90 - PSI_ISO });
    expect(s.r).toBeCloseTo(1, 12);
    expect(s.normalised.H).toBeCloseTo(0.5, 12);
  });

  it('recovers r at its own free-neck angle, tan²ψ = (1 + r)/r (Hill 1952)', () => {
    for (const r of [0.5, 1, 2, 3]) {
      const psi = Math.atan(Math.sqrt((1 + r) / r)) * DEG;
      expect(solveNormalAnisotropyFromAngle({ neckAngleDeg: psi, relativeDisplacementAngleDeg: 90 - psi }).r).toBeCloseTo(r, 11);
    }
  });

  it('agrees with the hand-derived forward form tan φ = tan θ (1 + 2r)/(tan²θ + 2 + 2r) (NECK-THEORY.md §6)', () => {
    for (const [r, theta] of [[0.6, 45], [1.7, 62], [3, 75]]) {
      const T = Math.tan(theta / DEG);
      const phi = Math.atan((T * (1 + 2 * r)) / (T * T + 2 + 2 * r)) * DEG;
      expect(solveNormalAnisotropyFromAngle({ neckAngleDeg: theta, relativeDisplacementAngleDeg: phi }).r).toBeCloseTo(r, 11);
    }
  });

  it('round-trips through the general forward relation for any load angle', () => {
    let checked = 0;
    for (const r of [0.4, 0.8, 1.5, 2.5, 4]) {
      const c = hillFromLankford({ r0: r, r45: r, r90: r });
      for (const theta of [25, 40, 55, 70, 85, 120]) {
        for (const alpha of [0, 30]) {
          const phi = predictRelativeDisplacementAngle(c, theta, alpha).relativeDisplacementAngleDeg;
          const s = solveNormalAnisotropyFromAngle({ neckAngleDeg: theta, relativeDisplacementAngleDeg: phi });
          expect(Math.abs(s.normalised.H - c.H)).toBeLessThan(1e-12);
          checked++;
        }
      }
    }
    expect(checked).toBe(60);
  });

  it('refuses angles with no positive r, naming the value and the range', () => {
    // r → 0 gives tan φ = tan θ/(tan²θ + 2), r → ∞ gives φ → θ: at θ = 60° that is (19.107°, 60°).
    expect(() => solveNormalAnisotropyFromAngle({ neckAngleDeg: 60, relativeDisplacementAngleDeg: 10 })).toThrow(
      /relativeDisplacementAngleDeg = 10° admits no positive r .*between 19\.107° and 60\.000°/,
    );
    expect(() => solveNormalAnisotropyFromAngle({ neckAngleDeg: 60, relativeDisplacementAngleDeg: 61 })).toThrow(/admits no positive r/);
    expect(() => solveNormalAnisotropyFromAngle({ neckAngleDeg: 90, relativeDisplacementAngleDeg: 0 })).toThrow(/perpendicular/);
  });
});
