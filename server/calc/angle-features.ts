import { mean } from 'simple-statistics';

/*
 * Features of an angle-versus-relative-displacement curve: the early maximum (the angle peaks while
 * the neck is forming) and the plateau after it (the neck has settled and moves as one band).
 */

/** A point of the curve fed to the feature search: one increment in use. */
export interface AnglePoint {
  readonly fromFrame: number;
  readonly toFrame: number;
  readonly angleDeg: number;
  readonly relativeDisplacement: number;
}

/** The extreme angle and where it occurs. */
export interface AngleMaximum {
  readonly angleDeg: number;
  readonly fromFrame: number;
  readonly toFrame: number;
  readonly relativeDisplacement: number;
  /** position in the list of used increments */
  readonly position: number;
}

/** The plateau: longest run of consecutive used increments within the angle band. */
export interface AnglePlateau {
  readonly startFrame: number;
  readonly endFrame: number;
  readonly increments: number;
  readonly meanAngleDeg: number;
  readonly minAngleDeg: number;
  readonly maxAngleDeg: number;
  readonly relativeDisplacementFrom: number;
  readonly relativeDisplacementTo: number;
}

/**
 * The maximum of the angle in the curve's own orientation: the largest angle if the curve is mostly
 * positive, the most negative one if it is mostly negative (a neck inclined the other way). Ties go to
 * the earliest increment.
 * @param points used increments in order (non-empty)
 * @param orientation +1 or −1
 * @returns the extreme point
 * @example findAngleMaximum([{ fromFrame: 0, toFrame: 1, angleDeg: 40, relativeDisplacement: 0.1 }], 1).angleDeg // 40
 */
export function findAngleMaximum(points: readonly AnglePoint[], orientation: 1 | -1): AngleMaximum {
  let best = 0;
  for (let i = 1; i < points.length; i++) {
    if (orientation * points[i].angleDeg > orientation * points[best].angleDeg) best = i;
  }
  const p = points[best];
  return { angleDeg: p.angleDeg, fromFrame: p.fromFrame, toFrame: p.toFrame, relativeDisplacement: p.relativeDisplacement, position: best };
}

/**
 * Longest window of consecutive points, starting at or after `from`, whose angles all lie within a band
 * of total width 2·halfBandDeg (max − min ≤ 2·halfBandDeg, i.e. within ±halfBandDeg of the band's
 * centre). Sliding window with monotone deques, O(n). Ties go to the earliest window.
 * @param points used increments in order
 * @param from first position allowed in the plateau (the maximum's position)
 * @param halfBandDeg half-width of the band, degrees (> 0)
 * @param minIncrements shortest window accepted as a plateau
 * @returns the plateau, or null if no window of minIncrements fits the band
 * @example findPlateau(points, 0, 1, 3) // { startFrame, endFrame, meanAngleDeg, … } | null
 */
export function findPlateau(
  points: readonly AnglePoint[],
  from: number,
  halfBandDeg: number,
  minIncrements: number,
): AnglePlateau | null {
  const a = points.map((p) => p.angleDeg);
  const maxQ: number[] = [];
  const minQ: number[] = [];
  let lo = from;
  let bestLo = from;
  let bestLen = 0;
  for (let hi = from; hi < a.length; hi++) {
    while (maxQ.length > 0 && a[maxQ[maxQ.length - 1]] <= a[hi]) maxQ.pop();
    maxQ.push(hi);
    while (minQ.length > 0 && a[minQ[minQ.length - 1]] >= a[hi]) minQ.pop();
    minQ.push(hi);
    while (a[maxQ[0]] - a[minQ[0]] > 2 * halfBandDeg) {
      lo++;
      if (maxQ[0] < lo) maxQ.shift();
      if (minQ[0] < lo) minQ.shift();
    }
    if (hi - lo + 1 > bestLen) {
      bestLen = hi - lo + 1;
      bestLo = lo;
    }
  }
  if (bestLen < minIncrements) return null;
  const win = points.slice(bestLo, bestLo + bestLen);
  const angles = win.map((p) => p.angleDeg);
  return {
    startFrame: win[0].fromFrame,
    endFrame: win[win.length - 1].toFrame,
    increments: bestLen,
    meanAngleDeg: mean(angles),
    minAngleDeg: angles.reduce((m, v) => Math.min(m, v), Infinity),
    maxAngleDeg: angles.reduce((m, v) => Math.max(m, v), -Infinity),
    relativeDisplacementFrom: win[0].relativeDisplacement,
    relativeDisplacementTo: win[win.length - 1].relativeDisplacement,
  };
}
