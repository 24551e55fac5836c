import { toRad } from './input-checks';

/*
 * Symmetric second-order tensors in the sheet plane, with TENSOR shear components (xy = ½ γ for a
 * strain rate). Kept apart from the Hill formulas so that frame changes are written once.
 */

/** In-plane vector. */
export interface Vec2 {
  readonly x: number;
  readonly y: number;
}

/** Symmetric in-plane tensor (stress or strain rate), tensor shear component. */
export interface SymTensor2 {
  readonly xx: number;
  readonly yy: number;
  readonly xy: number;
}

/**
 * Components of a tensor in a frame whose x' axis lies at `angleDeg` counter-clockwise from the
 * current x axis (x' = (c, s), y' = (−s, c)).
 * @param t tensor in the current frame
 * @param angleDeg angle of the new x' axis, degrees, counter-clockwise positive
 * @returns the same tensor in the new frame
 * @example inFrame({ xx: 1, yy: 0, xy: 0 }, 90) // ≈ { xx: 0, yy: 1, xy: 0 }
 */
export function inFrame(t: SymTensor2, angleDeg: number): SymTensor2 {
  const a = toRad(angleDeg);
  const c = Math.cos(a);
  const s = Math.sin(a);
  return {
    xx: c * c * t.xx + 2 * c * s * t.xy + s * s * t.yy,
    yy: s * s * t.xx - 2 * c * s * t.xy + c * c * t.yy,
    xy: -c * s * t.xx + (c * c - s * s) * t.xy + c * s * t.yy,
  };
}

/**
 * Quadratic contraction a · T · b.
 * @param t symmetric tensor
 * @param a left vector
 * @param b right vector
 * @returns the scalar a_i T_ij b_j
 * @example contract({ xx: 2, yy: 3, xy: 0 }, unit(0), unit(0)) // 2
 */
export function contract(t: SymTensor2, a: Vec2, b: Vec2): number {
  return a.x * (t.xx * b.x + t.xy * b.y) + a.y * (t.xy * b.x + t.yy * b.y);
}

/**
 * Symmetric part of the dyad m ⊗ n: the strain rate (per unit band width) of a band with unit
 * normal n across which the velocity jumps by m.
 * @param m velocity-jump direction
 * @param n band normal
 * @returns ½ (m ⊗ n + n ⊗ m)
 * @example symDyad(unit(0), unit(0)) // { xx: 1, yy: 0, xy: 0 }
 */
export function symDyad(m: Vec2, n: Vec2): SymTensor2 {
  return { xx: m.x * n.x, yy: m.y * n.y, xy: 0.5 * (m.x * n.y + m.y * n.x) };
}

/**
 * Unit vector at `angleDeg` counter-clockwise from the x axis.
 * @param angleDeg direction, degrees
 * @returns (cos, sin)
 * @example unit(90) // ≈ { x: 0, y: 1 }
 */
export function unit(angleDeg: number): Vec2 {
  const a = toRad(angleDeg);
  return { x: Math.cos(a), y: Math.sin(a) };
}
