import { CalcInputError } from './errors';
import { assertHillAdmissible, hillFromLankford, type HillCoefficients } from './hill48';
import { hillStrainRate, hillStressFromStrainRate } from './hill48-flow';
import { requireAngleIn, requireFinite, requirePositive, toDeg } from './input-checks';
import { contract, inFrame, type SymTensor2, symDyad, unit, type Vec2 } from './plane-tensor';

/*
 * Localized necking in a thin rigid-plastic sheet after Hill 1952 ("On discontinuous plastic states,
 * with special reference to localized necking in thin sheets", J. Mech. Phys. Solids 1, 19-30), with
 * the Hill 1948 flow rule. Derivation and sign conventions: NECK-THEORY.md beside this file.
 *
 * Frames: x = loading axis, y = in-plane transverse; RD lies at −loadAngleDeg from x (the load is at
 * +loadAngleDeg from RD). Angles are degrees, counter-clockwise positive from +x. A neck line at θ has
 * tangent t = (cos θ, sin θ) and normal n = (sin θ, −cos θ); the velocity jump m is the direction in
 * which the +n side moves relative to the −n side, and φ is its angle from +x.
 */

/** Assumptions every neck-angle result rests on; shown on screen with the numbers. */
export const NECK_ASSUMPTIONS: readonly string[] = Object.freeze([
  'thin sheet in plane stress; the neck is a line across which the in-plane velocity jumps',
  'rigid-plastic material with the Hill 1948 quadratic yield function and its associated flow rule',
  'zero extension along the neck line (compatibility with the rigid material on either side)',
  'stress uniform along the neck; material axes RD/TD in the sheet plane',
]);

/** Free neck in uniaxial tension. */
export interface FreeNeckResult {
  /** The two zero-extension directions, degrees from the tensile axis, in (−90°, 90°], larger first. */
  readonly neckAnglesDeg: readonly [number, number];
  /** Relative-displacement angle φ for each neck direction (same order), degrees from the tensile axis. */
  readonly relativeDisplacementAnglesDeg: readonly [number, number];
  /** Uniaxial strain-rate direction in the load frame, normalised to ε̇xx = 1. */
  readonly strainRate: SymTensor2;
  readonly loadAngleDeg: number;
  readonly assumptions: readonly string[];
}

/** Imposed neck: predicted relative-displacement angle and the neck's stress state. */
export interface ImposedNeckResult {
  readonly neckAngleDeg: number;
  readonly loadAngleDeg: number;
  /** φ, degrees from the loading axis, in (−90°, 90°) */
  readonly relativeDisplacementAngleDeg: number;
  /** Stress in the neck, load frame, scaled so the traction across the neck is (1, 0). */
  readonly stress: SymTensor2;
  /** Band strain-rate direction, load frame, for a unit velocity jump (ε̇_tt = 0 by construction). */
  readonly strainRate: SymTensor2;
  /** m·n = sin(θ − φ): thinning rate per unit jump; > 0 for a neck. */
  readonly thinning: number;
  readonly assumptions: readonly string[];
}

/**
 * Free neck angle for normal anisotropy (r0 = r45 = r90 = r): tan²ψ = (1 + r)/r (Hill 1952).
 * @param r Lankford coefficient (> 0)
 * @returns ψ in degrees from the tensile axis, in (45°, 90°)
 * @throws {CalcInputError} if r is not a finite positive number
 * @example freeNeckAngleNormal(1) // 54.7356… = arctan √2
 */
export function freeNeckAngleNormal(r: number): number {
  const rr = requirePositive(r, 'r', 'a Lankford coefficient');
  return toDeg(Math.atan(Math.sqrt((1 + rr) / rr)));
}

/**
 * Free neck in uniaxial tension for Hill 1948 orthotropy, load at any angle to RD. The neck follows
 * the zero-extension directions of the uniaxial strain rate: ε̇xx + 2ε̇xy tanψ + ε̇yy tan²ψ = 0. For
 * load along RD this reduces to tan²ψ = −ε̇1/ε̇2 = (G + H)/H = (1 + r0)/r0, and then φ = 90° − ψ.
 * @param c Hill coefficients (positive definite form)
 * @param loadAngleDeg angle of the tensile axis from RD, degrees (default 0)
 * @returns both neck directions and their relative-displacement angles
 * @throws {CalcInputError} if the coefficients are not admissible, or the uniaxial strain rate has no
 *   real zero-extension direction (width strain ≥ 0: no localized neck in Hill's sense)
 * @example freeNeckAngle({ F: 0.5, G: 0.5, H: 0.5, N: 1.5 }).neckAnglesDeg // [54.7356…, −54.7356…]
 */
export function freeNeckAngle(c: HillCoefficients, loadAngleDeg = 0): FreeNeckResult {
  assertHillAdmissible(c);
  const alpha = requireFinite(loadAngleDeg, 'loadAngleDeg');
  const sMat = inFrame({ xx: 1, yy: 0, xy: 0 }, -alpha);
  const eRaw = inFrame(hillStrainRate(c, sMat), alpha);
  const e: SymTensor2 = { xx: 1, yy: eRaw.yy / eRaw.xx, xy: eRaw.xy / eRaw.xx };
  const disc = e.xy * e.xy - e.xx * e.yy;
  if (!(e.yy < 0) || !(disc > 0)) {
    throw new CalcInputError(
      `uniaxial tension at loadAngleDeg = ${alpha}° gives width strain rate ε̇yy/ε̇xx = ${e.yy}, not < 0: ` +
        'no direction of zero extension, so no localized (Hill) neck forms',
      { field: 'loadAngleDeg', value: alpha },
    );
  }
  const root = Math.sqrt(disc);
  // Roots of ε̇yy T² + 2ε̇xy T + ε̇xx = 0 in T = tan ψ; with ε̇yy < 0 < ε̇xx they have opposite signs.
  const a1 = toDeg(Math.atan((-e.xy - root) / e.yy));
  const a2 = toDeg(Math.atan((-e.xy + root) / e.yy));
  const angles: [number, number] = a1 >= a2 ? [a1, a2] : [a2, a1];
  const phis: [number, number] = [jumpAngleForStrain(e, angles[0]), jumpAngleForStrain(e, angles[1])];
  return { neckAnglesDeg: angles, relativeDisplacementAnglesDeg: phis, strainRate: e, loadAngleDeg: alpha, assumptions: NECK_ASSUMPTIONS };
}

/**
 * Free neck for normal anisotropy from r, through the general Hill 1948 route (same result as
 * freeNeckAngleNormal, plus the relative-displacement angles).
 * @param r Lankford coefficient (> 0)
 * @returns the free-neck result for F = G, N = (2r + 1)G, G + H = 1
 * @throws {CalcInputError} if r is not positive
 * @example freeNeckFromR(1).relativeDisplacementAnglesDeg[0] // 35.2643…
 */
export function freeNeckFromR(r: number): FreeNeckResult {
  return freeNeckAngle(hillFromLankford({ r0: r, r45: r, r90: r }));
}

/**
 * Predict the relative-displacement angle φ for a neck imposed at θ to the load (groove or notch),
 * with the traction across the neck parallel to the load axis. Closed form: with ε̇ = sym(m ⊗ n) and
 * σ = L⁻¹ε̇, the condition e_y·σ·n = 0 is linear in m, so m is the null direction of a linear form.
 * For load along RD: tan φ = tan θ (D + 2NH) / (D tan²θ + 2N(G + H)), D = FG + GH + HF.
 * @param c Hill coefficients (positive definite form)
 * @param neckAngleDeg θ, neck line from the loading axis, in (0°, 180°)
 * @param loadAngleDeg angle of the load from RD, degrees (default 0)
 * @returns φ with the neck's stress and strain-rate state
 * @throws {CalcInputError} if θ is outside (0°, 180°), the coefficients are not admissible, or the
 *   solution would thicken the sheet (m·n ≤ 0: not a neck)
 * @example predictRelativeDisplacementAngle({ F: 0.5, G: 0.5, H: 0.5, N: 1.5 }, 54.7356).relativeDisplacementAngleDeg // ≈ 35.26
 */
export function predictRelativeDisplacementAngle(c: HillCoefficients, neckAngleDeg: number, loadAngleDeg = 0): ImposedNeckResult {
  assertHillAdmissible(c);
  const theta = requireAngleIn(neckAngleDeg, 'neckAngleDeg', 0, 180, 'a neck line crossing the strip must be inclined to the load');
  const alpha = requireFinite(loadAngleDeg, 'loadAngleDeg');
  const n = neckNormal(theta);
  const g = (m: Vec2): number => transverseTraction(c, m, n, alpha);
  let m = normalise({ x: g({ x: 0, y: 1 }), y: -g({ x: 1, y: 0 }) });
  // The line of m is fixed; tension (traction along +x doing positive work) picks m_x > 0.
  if (m.x < 0) m = { x: -m.x, y: -m.y };
  const phi = toDeg(Math.atan2(m.y, m.x));
  const thinning = m.x * n.x + m.y * n.y;
  if (!(thinning > 1e-12)) {
    throw new CalcInputError(
      `neckAngleDeg = ${theta}° with F = ${c.F}, G = ${c.G}, H = ${c.H}, N = ${c.N} gives φ = ${phi}° ≥ θ: ` +
        'the band would thicken (m·n ≤ 0), so no admissible localized neck exists at this angle',
      { field: 'neckAngleDeg', value: theta },
    );
  }
  const strainRate = symDyad(m, n);
  const sLoad = inFrame(hillStressFromStrainRate(c, inFrame(strainRate, -alpha)), alpha);
  const p = sLoad.xx * n.x + sLoad.xy * n.y;
  const stress = { xx: sLoad.xx / p, yy: sLoad.yy / p, xy: sLoad.xy / p };
  return { neckAngleDeg: theta, loadAngleDeg: alpha, relativeDisplacementAngleDeg: phi, stress, strainRate, thinning, assumptions: NECK_ASSUMPTIONS };
}

/** Band normal for a neck line at θ (tangent rotated by −90°, so n points towards +x for 0 < θ < 180°). */
export function neckNormal(thetaDeg: number): Vec2 {
  const t = unit(thetaDeg);
  return { x: t.y, y: -t.x };
}

/** y-component of the traction σ·n (load frame) for the stress that drives a unit jump m. */
function transverseTraction(c: HillCoefficients, m: Vec2, n: Vec2, alpha: number): number {
  const sLoad = inFrame(hillStressFromStrainRate(c, inFrame(symDyad(m, n), -alpha)), alpha);
  return contract(sLoad, { x: 0, y: 1 }, n);
}

/** Jump angle of a band along ψ carrying strain rate e (ε̇_tt = 0): m = ε̇_nn n + 2ε̇_nt t. */
function jumpAngleForStrain(e: SymTensor2, psiDeg: number): number {
  const t = unit(psiDeg);
  const n = neckNormal(psiDeg);
  const enn = contract(e, n, n);
  const ent = contract(e, n, t);
  let m = { x: enn * n.x + 2 * ent * t.x, y: enn * n.y + 2 * ent * t.y };
  if (m.x < 0) m = { x: -m.x, y: -m.y };
  return toDeg(Math.atan2(m.y, m.x));
}

function normalise(v: Vec2): Vec2 {
  const len = Math.hypot(v.x, v.y);
  return { x: v.x / len, y: v.y / len };
}
