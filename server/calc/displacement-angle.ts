import { median } from 'simple-statistics';
import { type AngleMaximum, type AnglePlateau, type AnglePoint, findAngleMaximum, findPlateau } from './angle-features';
import { CalcInputError } from './errors';
import { requireFinite, requireInteger, requirePositive, toDeg } from './input-checks';
import { movingMedian } from './moving-median';
import { cleanHistory, type DroppedRow, type FrameGap, orientForTension, type PointFrame } from './relative-history';
import { CALC_VERSION } from './version';

export type { PointFrame } from './relative-history';

/** Adjustable parameters; every default is stated here and returned with the result. */
export interface DisplacementAngleOptions {
  /** Increments before the relative displacement first reaches this value are ignored (neck not yet formed). Default 0, input length unit. */
  readonly minRelativeDisplacement?: number;
  /** Odd moving-median window (in increments) over the increment rates Δ/Δframe, per component, before the angle. Default 1 (off). */
  readonly smoothingWindow?: number;
  /** Plateau band half-width in degrees: all plateau angles within ±this of the band centre. Default 1. */
  readonly plateauHalfBandDeg?: number;
  /** Shortest run of increments accepted as a plateau. Default 5. */
  readonly minPlateauIncrements?: number;
  /** Detect and correct reversed point order (assumes tension). Default true. */
  readonly detectReversedOrder?: boolean;
}

export const DISPLACEMENT_ANGLE_DEFAULTS: Required<DisplacementAngleOptions> = Object.freeze({
  minRelativeDisplacement: 0,
  smoothingWindow: 1,
  plateauHalfBandDeg: 1,
  minPlateauIncrements: 5,
  detectReversedOrder: true,
});

export const SIGN_CONVENTION =
  'angle = atan2(Δy, Δx) in degrees of the increment of point 2 relative to point 1; x = loading axis, ' +
  'y = in-plane transverse axis 90° counter-clockwise from x; 0° = along the load, positive counter-clockwise';

export const RELATIVE_DISPLACEMENT_DEFINITION =
  'relative displacement = |d(frame) − d(first frame)| with d = u(point 2) − u(point 1), in the input length unit';

/** One increment between consecutive usable frames. */
export interface AngleIncrement extends AnglePoint {
  /** raw increment of the relative displacement (angleDeg uses the smoothed direction when smoothing is on) */
  readonly dx: number;
  readonly dy: number;
  /** cumulative path length Σ|Δ| up to toFrame (noise adds to it; shown for reference) */
  readonly pathLength: number;
  readonly spansGap: boolean;
  /** 'zero-length' increments have no direction: their angleDeg is NaN and they take no part in max/plateau */
  readonly status: 'used' | 'below-threshold' | 'zero-length';
}

export interface DisplacementAngleResult {
  readonly calcVersion: string;
  readonly parameters: Required<DisplacementAngleOptions>;
  readonly signConvention: string;
  readonly relativeDisplacementDefinition: string;
  readonly curve: readonly AngleIncrement[];
  /** +1 if the used angles are mostly ≥ 0 (maximum = largest angle), −1 otherwise (most negative) */
  readonly orientation: 1 | -1;
  readonly maximum: AngleMaximum | null;
  readonly plateau: AnglePlateau | null;
  /** frames bounding at least one used increment */
  readonly framesUsed: readonly number[];
  readonly droppedRows: readonly DroppedRow[];
  readonly gaps: readonly FrameGap[];
  readonly reversedOrder: boolean;
  readonly warnings: readonly string[];
}

/**
 * Relative-displacement angle of two measuring points on either side of a neck, per frame increment,
 * with the early maximum and the plateau after it.
 * @param rows frames with both points' in-plane displacements (x = loading axis)
 * @param options thresholds, smoothing and plateau band (defaults in DISPLACEMENT_ANGLE_DEFAULTS)
 * @returns the curve, maximum, plateau, frames used, parameters, warnings and CALC_VERSION
 * @throws {CalcInputError} for bad options, duplicate frames, or fewer than 3 usable frames
 * @example relativeDisplacementAngle(rows, { smoothingWindow: 5 }).plateau?.meanAngleDeg
 */
export function relativeDisplacementAngle(rows: readonly PointFrame[], options: DisplacementAngleOptions = {}): DisplacementAngleResult {
  const parameters = resolveOptions(options);
  const clean = cleanHistory(rows);
  const warnings = [...clean.warnings];
  let samples = [...clean.samples];
  let reversedOrder = false;
  if (parameters.detectReversedOrder) {
    const oriented = orientForTension(samples);
    samples = oriented.samples;
    reversedOrder = oriented.reversed;
    if (oriented.warning) warnings.push(oriented.warning);
  }
  const gapStarts = new Set(clean.gaps.map((g) => g.afterFrame));
  const raw = samples.slice(1).map((b, i) => ({ a: samples[i], b, dx: b.dx - samples[i].dx, dy: b.dy - samples[i].dy }));
  const direction = smoothedDirections(raw, parameters.smoothingWindow);
  const curve: AngleIncrement[] = [];
  let path = 0;
  let reached = false;
  raw.forEach(({ a, b, dx, dy }, i) => {
    path += Math.hypot(dx, dy);
    const relativeDisplacement = Math.hypot(b.dx - samples[0].dx, b.dy - samples[0].dy);
    reached ||= relativeDisplacement >= parameters.minRelativeDisplacement;
    const [sx, sy] = direction[i];
    const zero = sx === 0 && sy === 0;
    curve.push({
      fromFrame: a.frame,
      toFrame: b.frame,
      dx,
      dy,
      angleDeg: zero ? Number.NaN : toDeg(Math.atan2(sy, sx)),
      relativeDisplacement,
      pathLength: path,
      spansGap: gapStarts.has(a.frame),
      status: zero ? 'zero-length' : reached ? 'used' : 'below-threshold',
    });
  });
  return summarise(curve, parameters, { clean, reversedOrder, warnings });
}

/**
 * Increment directions, optionally smoothed. The moving median runs over the increment RATES
 * (Δx/Δframe, Δy/Δframe): a median over positions would do nothing, because positions rise steadily by
 * more than the noise and the median of a monotone window is its centre value; over rates it removes
 * both isolated spikes and part of the scatter. Dividing by Δframe keeps an increment across a gap
 * comparable with its neighbours; the direction is unchanged by that scaling.
 */
function smoothedDirections(raw: ReadonlyArray<{ a: { frame: number }; b: { frame: number }; dx: number; dy: number }>, window: number): Array<[number, number]> {
  if (window === 1) return raw.map((r) => [r.dx, r.dy]);
  const rx = raw.map((r) => r.dx / (r.b.frame - r.a.frame));
  const ry = raw.map((r) => r.dy / (r.b.frame - r.a.frame));
  const mx = movingMedian(rx, window);
  const my = movingMedian(ry, window);
  return mx.map((x, i) => [x, my[i]]);
}

function summarise(
  curve: AngleIncrement[],
  parameters: Required<DisplacementAngleOptions>,
  ctx: { clean: ReturnType<typeof cleanHistory>; reversedOrder: boolean; warnings: string[] },
): DisplacementAngleResult {
  const { warnings } = ctx;
  const zero = curve.filter((c) => c.status === 'zero-length').length;
  if (zero > 0) warnings.push(`${zero} increment(s) of zero length have no direction and were left out`);
  const used = curve.filter((c) => c.status === 'used');
  const framesUsed = [...new Set(used.flatMap((c) => [c.fromFrame, c.toFrame]))];
  let orientation: 1 | -1 = 1;
  let maximum: AngleMaximum | null = null;
  let plateau: AnglePlateau | null = null;
  if (used.length === 0) {
    warnings.push(`no increment reaches minRelativeDisplacement = ${parameters.minRelativeDisplacement}: nothing to analyse`);
  } else {
    orientation = median(used.map((c) => c.angleDeg)) >= 0 ? 1 : -1;
    if (orientation < 0) warnings.push('angles are mostly negative (neck inclined clockwise): the maximum is the most negative angle');
    maximum = findAngleMaximum(used, orientation);
    plateau = findPlateau(used, maximum.position, parameters.plateauHalfBandDeg, parameters.minPlateauIncrements);
    if (!plateau) {
      warnings.push(
        `no plateau: no run of ${parameters.minPlateauIncrements} increments after the maximum stays within ±${parameters.plateauHalfBandDeg}°`,
      );
    }
  }
  return {
    calcVersion: CALC_VERSION,
    parameters,
    signConvention: SIGN_CONVENTION,
    relativeDisplacementDefinition: RELATIVE_DISPLACEMENT_DEFINITION,
    curve,
    orientation,
    maximum,
    plateau,
    framesUsed,
    droppedRows: ctx.clean.dropped,
    gaps: ctx.clean.gaps,
    reversedOrder: ctx.reversedOrder,
    warnings,
  };
}

function resolveOptions(o: DisplacementAngleOptions): Required<DisplacementAngleOptions> {
  const p = { ...DISPLACEMENT_ANGLE_DEFAULTS, ...o };
  const minRel = requireFinite(p.minRelativeDisplacement, 'minRelativeDisplacement');
  if (minRel < 0) {
    throw new CalcInputError(`minRelativeDisplacement = ${minRel} is negative: a displacement threshold must be ≥ 0`, {
      field: 'minRelativeDisplacement',
      value: minRel,
    });
  }
  requireInteger(p.smoothingWindow, 'smoothingWindow', 1);
  requirePositive(p.plateauHalfBandDeg, 'plateauHalfBandDeg', 'a band half-width');
  requireInteger(p.minPlateauIncrements, 'minPlateauIncrements', 2);
  return p;
}
