import { CalcInputError } from './errors';
import { requireFinite, requirePositive } from './input-checks';

/*
 * Hill 1948 quadratic yield criterion in plane stress (R. Hill, "A theory of the yielding and plastic
 * flow of anisotropic metals", Proc. R. Soc. Lond. A 193 (1948) 281-297), material axes
 * 1 = rolling direction (RD), 2 = transverse direction (TD), 3 = sheet normal, σ3 = τ13 = τ23 = 0:
 *
 *   f(σ) = (G + H) σ11² − 2H σ11 σ22 + (H + F) σ22² + 2N σ12²
 *
 * Normalisation chosen here: G + H = 1. Then f = σ² for uniaxial tension σ along RD, so the
 * equivalent stress σ̄ = √(f / (G + H)) equals the RD uniaxial yield stress. Dividing by (G + H) keeps
 * σ̄ meaningful for coefficient sets that are not normalised. Isotropy is F = G = H = 1/2, N = 3/2,
 * where f reduces to the von Mises form σ11² − σ11σ22 + σ22² + 3σ12².
 */

/** Hill 1948 plane-stress coefficients (dimensionless when normalised with G + H = 1). */
export interface HillCoefficients {
  readonly F: number;
  readonly G: number;
  readonly H: number;
  readonly N: number;
}

/** Lankford coefficients (plastic width-to-thickness strain-rate ratios) at 0°, 45°, 90° to RD. */
export interface LankfordValues {
  readonly r0: number;
  readonly r45: number;
  readonly r90: number;
}

/** In-plane stress components in the material axes (σ11 along RD, σ22 along TD, σ12 shear). */
export interface MaterialStress {
  readonly s11: number;
  readonly s22: number;
  readonly s12: number;
}

/** The coefficients isotropy gives under G + H = 1 (reduces Hill 1948 to von Mises). */
export const ISOTROPIC_HILL: HillCoefficients = Object.freeze({ F: 0.5, G: 0.5, H: 0.5, N: 1.5 });

/**
 * Hill 1948 coefficients from the three Lankford coefficients, normalised with G + H = 1.
 * Inverts r0 = H/G, r90 = H/F, r45 = N/(F + G) − 1/2 (Hill 1948).
 * @param r Lankford coefficients r0, r45, r90, each > 0
 * @returns F, G, H, N with G + H = 1
 * @throws {CalcInputError} if any r is not a finite positive number
 * @example hillFromLankford({ r0: 1, r45: 1, r90: 1 }) // { F: 0.5, G: 0.5, H: 0.5, N: 1.5 }
 */
export function hillFromLankford(r: LankfordValues): HillCoefficients {
  const meaning = 'a Lankford coefficient is a ratio of width to thickness plastic strain and';
  const r0 = requirePositive(r.r0, 'r0', meaning);
  const r45 = requirePositive(r.r45, 'r45', meaning);
  const r90 = requirePositive(r.r90, 'r90', meaning);
  const G = 1 / (1 + r0);
  const H = r0 / (1 + r0);
  const F = H / r90;
  const N = (r45 + 0.5) * (F + G);
  return { F, G, H, N };
}

/**
 * Lankford coefficients from Hill 1948 coefficients (any normalisation; the ratios are scale-free).
 * @param c Hill coefficients with F, G, H, N all > 0 (positive r-values need them)
 * @returns r0 = H/G, r45 = N/(F + G) − 1/2, r90 = H/F
 * @throws {CalcInputError} if a coefficient is not positive or r45 comes out ≤ 0
 * @example lankfordFromHill({ F: 0.5, G: 0.5, H: 0.5, N: 1.5 }) // { r0: 1, r45: 1, r90: 1 }
 */
export function lankfordFromHill(c: HillCoefficients): LankfordValues {
  const meaning = 'for positive Lankford coefficients this Hill coefficient';
  const F = requirePositive(c.F, 'F', meaning);
  const G = requirePositive(c.G, 'G', meaning);
  const H = requirePositive(c.H, 'H', meaning);
  const N = requirePositive(c.N, 'N', meaning);
  const r45 = N / (F + G) - 0.5;
  if (!(r45 > 0)) {
    throw new CalcInputError(
      `N = ${N} gives r45 = N/(F+G) − 1/2 = ${r45}, not > 0: N must exceed (F + G)/2 = ${(F + G) / 2}`,
      { field: 'N', value: N },
    );
  }
  return { r0: H / G, r45, r90: H / F };
}

/**
 * Rescale coefficients so that G + H = 1 (the yield locus is unchanged; only the scale of f moves).
 * @param c admissible Hill coefficients
 * @returns the same coefficients divided by G + H
 * @throws {CalcInputError} if the coefficients are not admissible (see assertHillAdmissible)
 * @example normaliseHill({ F: 1, G: 1, H: 1, N: 3 }) // { F: 0.5, G: 0.5, H: 0.5, N: 1.5 }
 */
export function normaliseHill(c: HillCoefficients): HillCoefficients {
  assertHillAdmissible(c);
  const k = c.G + c.H;
  return { F: c.F / k, G: c.G / k, H: c.H / k, N: c.N / k };
}

/**
 * Check that the plane-stress quadratic form is positive definite, i.e. that the yield locus is a
 * closed convex ellipsoid in (σ11, σ22, σ12). For the 2×2 normal block [[G+H, −H], [−H, H+F]] this
 * is G + H > 0 and det = FG + GH + HF > 0 (which with G + H > 0 also gives H + F > 0); the shear
 * term needs N > 0. F, G or H alone may be negative and the locus still be convex.
 * @param c Hill coefficients
 * @throws {CalcInputError} naming the first violated condition
 * @example assertHillAdmissible({ F: 0.5, G: 0.5, H: 0.5, N: 1.5 }) // passes
 */
export function assertHillAdmissible(c: HillCoefficients): void {
  const F = requireFinite(c.F, 'F');
  const G = requireFinite(c.G, 'G');
  const H = requireFinite(c.H, 'H');
  const N = requireFinite(c.N, 'N');
  const fail = (msg: string, field: string, value: number): never => {
    throw new CalcInputError(`${msg}: the Hill 1948 yield locus would not be closed and convex`, { field, value });
  };
  if (!(G + H > 0)) fail(`G + H = ${G + H} (G = ${G}, H = ${H}) is not > 0`, 'G+H', G + H);
  const det = F * G + G * H + H * F;
  if (!(det > 0)) fail(`FG + GH + HF = ${det} (F = ${F}, G = ${G}, H = ${H}) is not > 0`, 'FG+GH+HF', det);
  if (!(N > 0)) fail(`N = ${N} is not > 0`, 'N', N);
}

/**
 * Value of the Hill 1948 plane-stress quadratic form f(σ) (see the file comment).
 * @param c Hill coefficients
 * @param s stress in material axes
 * @returns f(σ), in stress² units
 * @example hillYieldFunction(ISOTROPIC_HILL, { s11: 1, s22: 0, s12: 0 }) // 1
 */
export function hillYieldFunction(c: HillCoefficients, s: MaterialStress): number {
  return (c.G + c.H) * s.s11 ** 2 - 2 * c.H * s.s11 * s.s22 + (c.H + c.F) * s.s22 ** 2 + 2 * c.N * s.s12 ** 2;
}

/**
 * Hill 1948 equivalent stress σ̄ = √(f(σ) / (G + H)), normalised so that σ̄ equals the stress of
 * uniaxial tension along RD. With G + H = 1 this is simply √f.
 * @param c admissible Hill coefficients
 * @param s stress in material axes
 * @returns the equivalent stress (≥ 0)
 * @throws {CalcInputError} if the coefficients are not admissible
 * @example hillEquivalentStress(ISOTROPIC_HILL, { s11: 0, s22: 0, s12: 1 }) // √3 (von Mises, pure shear)
 */
export function hillEquivalentStress(c: HillCoefficients, s: MaterialStress): number {
  assertHillAdmissible(c);
  return Math.sqrt(hillYieldFunction(c, s) / (c.G + c.H));
}
