import { type HillCoefficients } from './hill48';
import { type SymTensor2 } from './plane-tensor';

/*
 * Associated flow rule of Hill 1948 in plane stress, material axes (1 = RD, 2 = TD), tensor shear:
 *
 *   ε̇11 = λ [(G + H) σ11 − H σ22],  ε̇22 = λ [(H + F) σ22 − H σ11],  ε̇12 = λ N σ12,  ε̇33 = −(ε̇11 + ε̇22)
 *
 * (Hill 1948, eq. for dε_x … dε_xy = dλ N τ_xy). Only directions matter for the neck relations, so
 * λ is set to 1. The inverse uses the adjugate of the normal block, D = FG + GH + HF:
 *
 *   σ11 = [(H + F) ε̇11 + H ε̇22] / D,  σ22 = [H ε̇11 + (G + H) ε̇22] / D,  σ12 = ε̇12 / N
 */

/**
 * Strain-rate direction (λ = 1) of the associated flow rule for a stress in material axes.
 * @param c Hill coefficients (assumed admissible; callers check)
 * @param s stress in material axes (xx = σ11 along RD)
 * @returns strain rate in material axes, tensor shear
 * @example hillStrainRate(ISOTROPIC_HILL, { xx: 1, yy: 0, xy: 0 }) // { xx: 1, yy: -0.5, xy: 0 }
 */
export function hillStrainRate(c: HillCoefficients, s: SymTensor2): SymTensor2 {
  return {
    xx: (c.G + c.H) * s.xx - c.H * s.yy,
    yy: (c.H + c.F) * s.yy - c.H * s.xx,
    xy: c.N * s.xy,
  };
}

/**
 * Stress (up to the positive factor 1/λ) that produces a given strain rate under the flow rule.
 * @param c admissible Hill coefficients (D = FG + GH + HF > 0, N > 0)
 * @param e strain rate in material axes, tensor shear
 * @returns stress in material axes
 * @example hillStressFromStrainRate(ISOTROPIC_HILL, { xx: 1, yy: -0.5, xy: 0 }) // { xx: 1, yy: 0, xy: 0 }
 */
export function hillStressFromStrainRate(c: HillCoefficients, e: SymTensor2): SymTensor2 {
  const d = c.F * c.G + c.G * c.H + c.H * c.F;
  return {
    xx: ((c.H + c.F) * e.xx + c.H * e.yy) / d,
    yy: (c.H * e.xx + (c.G + c.H) * e.yy) / d,
    xy: e.xy / c.N,
  };
}

/**
 * D·σ (D = FG + GH + HF) for a given strain rate, split into the part independent of H and the part
 * proportional to H: D σ = σ⁽⁰⁾ + H σ⁽¹⁾. Every entry of D·L⁻¹ is affine in H (F, G, N fixed), which
 * is what makes the inverse problem "H from a measured angle" linear with a closed-form solution.
 * @param F Hill F
 * @param G Hill G
 * @param N Hill N (> 0)
 * @param e strain rate in material axes
 * @returns { base: σ⁽⁰⁾, perH: σ⁽¹⁾ }
 * @example hStressSplit(0.5, 0.5, 1.5, { xx: 1, yy: 0, xy: 0 }) // base.xx = 0.5, perH.xx = 1
 */
export function hStressSplit(F: number, G: number, N: number, e: SymTensor2): { base: SymTensor2; perH: SymTensor2 } {
  return {
    base: { xx: F * e.xx, yy: G * e.yy, xy: ((F * G) / N) * e.xy },
    perH: { xx: e.xx + e.yy, yy: e.xx + e.yy, xy: ((F + G) / N) * e.xy },
  };
}
