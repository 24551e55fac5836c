import { CalcInputError } from './errors';
import { assertHillAdmissible, type HillCoefficients, ISOTROPIC_HILL } from './hill48';
import { requireInteger } from './input-checks';

/*
 * Yield loci in the σ1–σ2 plane (τ = 0, σ1 along RD), normalised by the RD uniaxial yield stress σ0:
 * with x = σ1/σ0, y = σ2/σ0 the Hill 1948 locus is (G+H)x² − 2Hxy + (H+F)y² = G + H. Points are
 * generated in polar form: along the direction (cos α, sin α) the radius is √((G+H)/q(α)),
 * q(α) = (G+H)cos²α − 2H cos α sin α + (H+F) sin²α, which is > 0 for every α exactly when the form
 * is positive definite — the same condition that makes the locus a closed convex ellipse.
 */

/** One point of a normalised locus. */
export interface LocusPoint {
  /** σ1/σ0, σ1 along RD */
  readonly s1: number;
  /** σ2/σ0, σ2 along TD */
  readonly s2: number;
}

/** Normalised yield loci for one coefficient set, with the von Mises locus beside it. */
export interface YieldLocusResult {
  readonly coefficients: HillCoefficients;
  /** Hill 1948 locus; the last point repeats the first so a polyline closes exactly. */
  readonly hill: readonly LocusPoint[];
  /** von Mises locus (Hill with F = G = H = 1/2, N = 3/2), same sampling and closure. */
  readonly vonMises: readonly LocusPoint[];
  /** Characteristic Hill points, all normalised by σ0 (RD uniaxial yield). */
  readonly keyPoints: {
    /** σ_TD/σ0 = √((G+H)/(H+F)) */
    readonly uniaxialTD: number;
    /** equibiaxial σ1 = σ2 = √((G+H)/(F+G)) */
    readonly equibiaxial: number;
    /** RD plane strain (ε̇2 = 0, σ2 = Hσ1/(H+F)): σ1/σ0 */
    readonly planeStrainRD: LocusPoint;
  };
  readonly normalisation: string;
}

/**
 * Points of the Hill 1948 and von Mises yield loci in the σ1–σ2 plane (τ = 0).
 * @param c Hill coefficients (any scale; the locus is normalised to the RD uniaxial yield stress)
 * @param pointCount number of distinct points around the locus (≥ 8); one closing point is added
 * @returns both loci, numerically closed, plus characteristic points
 * @throws {CalcInputError} if the quadratic form is not positive definite (locus open or non-convex)
 *   or pointCount is not a whole number ≥ 8
 * @example yieldLocus({ F: 0.5, G: 0.5, H: 0.5, N: 1.5 }, 360).hill[0] // { s1: 1, s2: 0 }
 */
export function yieldLocus(c: HillCoefficients, pointCount = 360): YieldLocusResult {
  assertHillAdmissible(c);
  requireInteger(pointCount, 'pointCount', 8);
  const F = c.F;
  const G = c.G;
  const H = c.H;
  const D = F * G + G * H + H * F;
  return {
    coefficients: c,
    hill: sampleLocus(c, pointCount),
    vonMises: sampleLocus(ISOTROPIC_HILL, pointCount),
    keyPoints: {
      uniaxialTD: Math.sqrt((G + H) / (H + F)),
      equibiaxial: Math.sqrt((G + H) / (F + G)),
      // ε̇2 = (H+F)σ2 − Hσ1 = 0 fixes σ2/σ1 = H/(H+F); substituting in f = (G+H)σ0² gives σ1.
      planeStrainRD: {
        s1: Math.sqrt(((G + H) * (H + F)) / D),
        s2: (H / (H + F)) * Math.sqrt(((G + H) * (H + F)) / D),
      },
    },
    normalisation: 'stresses divided by the uniaxial yield stress along RD; σ1 along RD, σ2 along TD, τ = 0',
  };
}

function sampleLocus(c: HillCoefficients, pointCount: number): LocusPoint[] {
  const points: LocusPoint[] = [];
  for (let i = 0; i < pointCount; i++) {
    const a = (2 * Math.PI * i) / pointCount;
    const ca = Math.cos(a);
    const sa = Math.sin(a);
    const q = (c.G + c.H) * ca * ca - 2 * c.H * ca * sa + (c.H + c.F) * sa * sa;
    if (!(q > 0)) {
      // Cannot happen after assertHillAdmissible; kept so a future caller skipping the check fails loudly.
      throw new CalcInputError(`quadratic form q = ${q} ≤ 0 at ${(a * 180) / Math.PI}°: locus not closed`, { q });
    }
    const rho = Math.sqrt((c.G + c.H) / q);
    points.push({ s1: rho * ca, s2: rho * sa });
  }
  points.push(points[0]);
  return points;
}
