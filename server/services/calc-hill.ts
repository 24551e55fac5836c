import type { HFromAngleBody, HFromAngleResult, Hill48Body, Hill48Result, NeckAngleBody, NeckAngleResult } from '../../shared/calc.js';
import { CalcInputError } from '../calc/errors.js';
import { H_ESTIMATE_CAUTIONS } from '../calc/h-from-angle.js';
import { hillFromLankford, lankfordFromHill, normaliseHill } from '../calc/hill48.js';
import { freeNeckAngle, NECK_ASSUMPTIONS, predictRelativeDisplacementAngle } from '../calc/neck-angle.js';
import { solveHFromAngle, solveNormalAnisotropyFromAngle } from '../calc/neck-angle-inverse.js';
import { CALC_VERSION } from '../calc/version.js';
import { yieldLocus } from '../calc/yield-locus.js';

/**
 * The Hill 1948 calculator endpoints: thin orchestration over server/calc/. Inadmissible input
 * throws CalcInputError, which the error middleware answers with 400 and the engine's message.
 */

const LOCUS_POINTS = 180;

export const HILL_ASSUMPTIONS: readonly string[] = Object.freeze([
  'Plane stress (σ3 = 0) in a thin sheet; material axes RD (1) and TD (2) in the sheet plane.',
  'Hill 1948 quadratic yield function, normalised with G + H = 1 (the RD uniaxial yield stress is the unit stress).',
  'Lankford coefficients r = width / thickness plastic strain ratio: r0 = H/G, r90 = H/F, r45 = N/(F + G) − 1/2.',
  ...NECK_ASSUMPTIONS.map((a) => `Neck relations: ${a}.`),
]);

/** Lankford ↔ Hill coefficients, yield locus beside von Mises, free neck for tension along RD. */
export function hill48(body: Hill48Body): Hill48Result {
  const coefficients = body.from === 'lankford' ? hillFromLankford(body.lankford) : normaliseHill(body.coefficients);
  let lankford = null;
  try {
    lankford = lankfordFromHill(coefficients);
  } catch (err) {
    // Expected for admissible loci with a non-positive F, G, H or r45: the ellipse exists, r-values do not.
    if (!(err instanceof CalcInputError)) throw err;
  }
  const locus = yieldLocus(coefficients, LOCUS_POINTS);
  let freeNeck: Hill48Result['freeNeck'] = null;
  let freeNeckRefusal: string | null = null;
  try {
    const f = freeNeckAngle(coefficients, 0);
    freeNeck = { neckAnglesDeg: [...f.neckAnglesDeg], relativeDisplacementAnglesDeg: [...f.relativeDisplacementAnglesDeg] };
  } catch (err) {
    // Expected when uniaxial tension along RD widens the strip (no zero-extension direction): no Hill neck.
    if (!(err instanceof CalcInputError)) throw err;
    freeNeckRefusal = err.message;
  }
  return {
    calcVersion: CALC_VERSION,
    coefficients,
    lankford,
    locus: { hill: [...locus.hill], vonMises: [...locus.vonMises], keyPoints: locus.keyPoints, normalisation: locus.normalisation },
    freeNeck,
    freeNeckRefusal,
    assumptions: [...HILL_ASSUMPTIONS],
    cautions: [...H_ESTIMATE_CAUTIONS],
  };
}

/** Imposed neck at θ → relative-displacement angle φ (traction across the neck parallel to the load). */
export function neckAngle(body: NeckAngleBody): NeckAngleResult {
  const r = predictRelativeDisplacementAngle(body.coefficients, body.neckAngleDeg, body.loadAngleDeg);
  return {
    calcVersion: CALC_VERSION,
    neckAngleDeg: r.neckAngleDeg,
    loadAngleDeg: r.loadAngleDeg,
    relativeDisplacementAngleDeg: r.relativeDisplacementAngleDeg,
    thinning: r.thinning,
    stress: r.stress,
    assumptions: [...r.assumptions, 'imposed neck: the traction across the neck is parallel to the load axis'],
    cautions: [...H_ESTIMATE_CAUTIONS],
  };
}

/** Measured φ at θ → H (F, G, N given, or normal anisotropy). */
export function hFromAngle(body: HFromAngleBody): HFromAngleResult {
  const measured = { neckAngleDeg: body.neckAngleDeg, relativeDisplacementAngleDeg: body.relativeDisplacementAngleDeg, loadAngleDeg: body.loadAngleDeg };
  const common = { calcVersion: CALC_VERSION, assumption: body.assumption, cautions: [...H_ESTIMATE_CAUTIONS] };
  if (body.assumption.kind === 'normal-anisotropy') {
    const s = solveNormalAnisotropyFromAngle(measured);
    return {
      ...common,
      H: s.normalised.H,
      coefficients: s.normalised,
      r: s.r,
      lankford: { r0: s.r, r45: s.r, r90: s.r },
      admissibleAngleRangeDeg: [...s.admissibleAngleRangeDeg],
      assumptions: [...s.assumptions, 'normal anisotropy: r0 = r45 = r90 = r (F = G, N = G + 2H), so the load angle does not enter'],
    };
  }
  const s = solveHFromAngle(measured, body.assumption);
  return {
    ...common,
    H: s.normalised.H,
    coefficients: s.normalised,
    r: null,
    lankford: s.lankford,
    admissibleAngleRangeDeg: [...s.admissibleAngleRangeDeg],
    assumptions: [...s.assumptions, `F, G, N given (F = ${body.assumption.F}, G = ${body.assumption.G}, N = ${body.assumption.N}); H reported with G + H = 1`],
  };
}
