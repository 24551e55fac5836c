import { CalcInputError } from './errors';
import { hillFromLankford, type HillCoefficients, type LankfordValues, lankfordFromHill } from './hill48';
import { hStressSplit } from './hill48-flow';
import { requireAngleIn, requireFinite, requirePositive, toDeg, toRad } from './input-checks';
import { NECK_ASSUMPTIONS, neckNormal, predictRelativeDisplacementAngle } from './neck-angle';
import { contract, inFrame, type SymTensor2, symDyad, unit, type Vec2 } from './plane-tensor';

/*
 * Inverse of the imposed-neck relation (see neck-angle.ts and NECK-THEORY.md). For a measured jump
 * angle φ the band strain rate ε̇ = sym(m ⊗ n) is known; the transverse-traction condition
 * e_y·σ·n = 0, multiplied by D = FG + GH + HF, reads A0 + H·A1 = 0 because every entry of D·L⁻¹ is
 * affine in H. The inverse is therefore the closed form H = −A0/A1 — no iteration, no bracketing.
 * Under normal anisotropy (F = G = 1, H = r, N = 1 + 2r after scaling by 1 + r) D·σ = ε̇ + r·tr(ε̇)·I,
 * again affine in the unknown r.
 */

/** Measured neck geometry and angle. */
export interface MeasuredNeck {
  /** θ, neck line from the loading axis, degrees, in (0°, 180°) */
  readonly neckAngleDeg: number;
  /** φ, relative-displacement angle from the loading axis, degrees, in (−90°, 90°) */
  readonly relativeDisplacementAngleDeg: number;
  /** load angle from RD, degrees (default 0) */
  readonly loadAngleDeg?: number;
}

/** H solved from a measured angle with F, G, N given. */
export interface HSolution {
  /** H on the scale of the given F, G, N */
  readonly H: number;
  /** The full coefficient set on the given scale */
  readonly coefficients: HillCoefficients;
  /** The same set normalised with G + H = 1 */
  readonly normalised: HillCoefficients;
  /** Lankford values implied (null when the implied r45 is not positive) */
  readonly lankford: LankfordValues | null;
  /** φ range, degrees, that positive H spans at this θ with a thinning band (open interval, sorted) */
  readonly admissibleAngleRangeDeg: readonly [number, number];
  readonly assumptions: readonly string[];
}

/** r (and the Hill set) solved from a measured angle assuming normal anisotropy. */
export interface NormalAnisotropySolution {
  readonly r: number;
  /** F = G = 1/(1+r), H = r/(1+r), N = (2r+1)/(1+r) */
  readonly normalised: HillCoefficients;
  /** φ range that 0 < r < ∞ spans at this θ, degrees, sorted */
  readonly admissibleAngleRangeDeg: readonly [number, number];
  readonly assumptions: readonly string[];
}

/**
 * Solve Hill's H from a measured relative-displacement angle, F, G and N given.
 * @param measured neck angle θ, measured jump angle φ, load angle from RD
 * @param given F, G, N (> 0, on any common scale)
 * @returns H (> 0) with the implied coefficient set
 * @throws {CalcInputError} if an angle is out of range, F, G or N is not positive, φ does not depend on H
 *   at this θ, or no positive H reproduces φ (the message gives the admissible φ range)
 * @example solveHFromAngle({ neckAngleDeg: 54.7356103172, relativeDisplacementAngleDeg: 35.2643896828 }, { F: 0.5, G: 0.5, N: 1.5 }).H // ≈ 0.5
 */
export function solveHFromAngle(measured: MeasuredNeck, given: { F: number; G: number; N: number }): HSolution {
  const F = requirePositive(given.F, 'F', 'for positive Lankford coefficients F');
  const G = requirePositive(given.G, 'G', 'for positive Lankford coefficients G');
  const N = requirePositive(given.N, 'N', 'the shear coefficient N');
  const { theta, phi, alpha } = checkMeasured(measured);
  const n = neckNormal(theta);
  const split = (m: Vec2): { a0: number; a1: number } => {
    const eMat = inFrame(symDyad(m, n), -alpha);
    const { base, perH } = hStressSplit(F, G, N, eMat);
    return { a0: transverse(base, n, alpha), a1: transverse(perH, n, alpha) };
  };
  const { a0, a1 } = split(unit(phi));
  // H sweeps φ monotonically between the null directions of the H-free and H-proportional parts.
  const sweep = sortedRange(nullAngle((m) => split(m).a0), nullAngle((m) => split(m).a1));
  if (!(sweep[1] - sweep[0] > 1e-9) || a1 === 0) {
    throw new CalcInputError(
      `at neckAngleDeg = ${theta}° the angle φ does not depend on H (with F = ${F}, G = ${G}, N = ${N}): H cannot be solved from φ`,
      { field: 'neckAngleDeg', value: theta },
    );
  }
  const range = thinningPart(sweep, theta);
  const H = -a0 / a1;
  if (!(H > 0) || !Number.isFinite(H) || !(range[0] < phi && phi < range[1])) {
    throw new CalcInputError(
      `relativeDisplacementAngleDeg = ${phi}° admits no positive H at θ = ${theta}° (F = ${F}, G = ${G}, N = ${N}; ` +
        `solution H = ${H}); positive H with a thinning neck gives φ between ${fmt(range[0])}° and ${fmt(range[1])}°`,
      { field: 'relativeDisplacementAngleDeg', value: phi, admissibleAngleRangeDeg: range },
    );
  }
  const coefficients = { F, G, H, N };
  // Re-running the forward relation rejects a solution that would thicken the band (not a neck).
  predictRelativeDisplacementAngle(coefficients, theta, alpha);
  const k = G + H;
  const normalised = { F: F / k, G: G / k, H: H / k, N: N / k };
  const lankford = N / (F + G) - 0.5 > 0 ? lankfordFromHill(coefficients) : null;
  return { H, coefficients, normalised, lankford, admissibleAngleRangeDeg: range, assumptions: NECK_ASSUMPTIONS };
}

/**
 * Solve the Lankford coefficient r (and H) from a measured angle, assuming normal anisotropy
 * (r0 = r45 = r90 = r, in-plane isotropic, so the load angle does not enter). Closed form:
 * r = (sin φ − cos θ sin(θ − φ)) / (2 cos θ sin(θ − φ)).
 * @param measured neck angle θ and measured jump angle φ
 * @returns r (> 0) and the normalised Hill set
 * @throws {CalcInputError} if an angle is out of range, θ = 90° (φ = 0 for every r), φ ≥ θ side
 *   (thickening band), or r would not be positive (message gives the admissible φ range)
 * @example solveNormalAnisotropyFromAngle({ neckAngleDeg: 54.7356103172, relativeDisplacementAngleDeg: 35.2643896828 }).r // ≈ 1
 */
export function solveNormalAnisotropyFromAngle(measured: MeasuredNeck): NormalAnisotropySolution {
  const { theta, phi } = checkMeasured(measured);
  const th = toRad(theta);
  const ph = toRad(phi);
  const thinning = Math.sin(th - ph);
  const cosT = Math.cos(th);
  // r → 0: tan φ = tan θ /(tan²θ + 2); r → ∞: φ → θ (the neck stops thinning).
  const r0End = toDeg(Math.atan2(Math.sin(th) * cosT, Math.sin(th) ** 2 + 2 * cosT * cosT));
  const range = thinningPart(sortedRange(r0End, theta > 90 ? theta - 180 : theta), theta);
  if (Math.abs(cosT) < 1e-12) {
    throw new CalcInputError(
      `neckAngleDeg = ${theta}°: a neck perpendicular to the load gives φ = 0 for every r, so r cannot be solved`,
      { field: 'neckAngleDeg', value: theta },
    );
  }
  const r = (Math.sin(ph) - cosT * thinning) / (2 * cosT * thinning);
  if (!(thinning > 0) || !(r > 0) || !Number.isFinite(r)) {
    throw new CalcInputError(
      `relativeDisplacementAngleDeg = ${phi}° admits no positive r at θ = ${theta}° under normal anisotropy ` +
        `(solution r = ${r}); positive r gives φ between ${fmt(range[0])}° and ${fmt(range[1])}°`,
      { field: 'relativeDisplacementAngleDeg', value: phi, admissibleAngleRangeDeg: range },
    );
  }
  const normalised = hillFromLankford({ r0: r, r45: r, r90: r });
  return { r, normalised, admissibleAngleRangeDeg: range, assumptions: NECK_ASSUMPTIONS };
}

function checkMeasured(measured: MeasuredNeck): { theta: number; phi: number; alpha: number } {
  const theta = requireAngleIn(measured.neckAngleDeg, 'neckAngleDeg', 0, 180, 'a neck line crossing the strip must be inclined to the load');
  const phi = requireAngleIn(
    measured.relativeDisplacementAngleDeg,
    'relativeDisplacementAngleDeg',
    -90,
    90,
    'in tension the two sides of the neck separate along +x, so |φ| < 90°',
  );
  const alpha = requireFinite(measured.loadAngleDeg ?? 0, 'loadAngleDeg');
  return { theta, phi, alpha };
}

/** e_y · (stress given in material axes, seen in the load frame) · n. */
function transverse(sMat: SymTensor2, n: Vec2, alpha: number): number {
  return contract(inFrame(sMat, alpha), { x: 0, y: 1 }, n);
}

/** Angle in (−90°, 90°] of the direction m that zeroes a linear form g(m). */
function nullAngle(g: (m: Vec2) => number): number {
  let x = g({ x: 0, y: 1 });
  let y = -g({ x: 1, y: 0 });
  if (x < 0) {
    x = -x;
    y = -y;
  }
  return toDeg(Math.atan2(y, x));
}

function sortedRange(a: number, b: number): [number, number] {
  return a <= b ? [a, b] : [b, a];
}

/** Part of a φ range where the band thins, sin(θ − φ) > 0, i.e. θ − 180° < φ < θ. */
function thinningPart(range: [number, number], theta: number): [number, number] {
  return [Math.max(range[0], theta - 180), Math.min(range[1], theta)];
}

function fmt(v: number): string {
  return v.toFixed(3);
}
