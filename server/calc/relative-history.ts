import { median } from 'simple-statistics';
import { CalcInputError } from './errors';

/*
 * Turns raw two-point displacement rows into a clean, ordered series of the relative displacement
 * d = u(point 2) − u(point 1). Only d matters: the increment Δu2 − Δu1 equals Δd, so any motion
 * common to both points (rigid translation of the strip, machine compliance) cancels.
 */

/** One measured frame: frame number or time, and the in-plane displacements of both points. */
export interface PointFrame {
  /** frame number or time; strictly increasing once sorted */
  readonly frame: number;
  readonly u1x: number;
  readonly u1y: number;
  readonly u2x: number;
  readonly u2y: number;
}

/** Relative displacement of point 2 with respect to point 1 at one frame. */
export interface RelativeSample {
  readonly frame: number;
  readonly dx: number;
  readonly dy: number;
}

/** A row left out, with the reason. */
export interface DroppedRow {
  /** position of the row in the input (0-based) */
  readonly row: number;
  readonly frame: number | null;
  readonly reason: string;
}

/** A jump in the frame sequence larger than 1.5 × the median frame step. */
export interface FrameGap {
  readonly afterFrame: number;
  readonly beforeFrame: number;
}

/** Clean relative history. */
export interface CleanHistory {
  readonly samples: readonly RelativeSample[];
  readonly dropped: readonly DroppedRow[];
  readonly gaps: readonly FrameGap[];
  readonly warnings: readonly string[];
}

/** Fewest frames the angle analysis needs: two increments. */
export const MIN_FRAMES = 3;

/**
 * Drop rows with a missing or non-finite value (reported), sort by frame (warned), refuse duplicate
 * frames, and list gaps in the frame sequence.
 * @param rows measured frames in any order
 * @returns the relative history with what was dropped and found
 * @throws {CalcInputError} if two rows share a frame, or fewer than MIN_FRAMES rows are usable
 * @example cleanHistory([{ frame: 0, u1x: 0, u1y: 0, u2x: 0, u2y: 0 }, …]).samples[0] // { frame: 0, dx: 0, dy: 0 }
 */
export function cleanHistory(rows: readonly PointFrame[]): CleanHistory {
  const dropped: DroppedRow[] = [];
  const warnings: string[] = [];
  const kept: RelativeSample[] = [];
  rows.forEach((r, row) => {
    if (!Number.isFinite(r.frame)) {
      dropped.push({ row, frame: null, reason: `frame/time value ${String(r.frame)} is not a number` });
      return;
    }
    const bad = (['u1x', 'u1y', 'u2x', 'u2y'] as const).filter((k) => !Number.isFinite(r[k]));
    if (bad.length > 0) {
      dropped.push({ row, frame: r.frame, reason: `missing or non-numeric ${bad.join(', ')}` });
      return;
    }
    kept.push({ frame: r.frame, dx: r.u2x - r.u1x, dy: r.u2y - r.u1y });
  });
  if (dropped.length > 0) warnings.push(`${dropped.length} row(s) dropped for missing or non-numeric values`);
  if (kept.some((s, i) => i > 0 && s.frame < kept[i - 1].frame)) {
    kept.sort((a, b) => a.frame - b.frame);
    warnings.push('frames were not in increasing order and have been sorted');
  }
  for (let i = 1; i < kept.length; i++) {
    if (kept[i].frame === kept[i - 1].frame) {
      throw new CalcInputError(`frame ${kept[i].frame} occurs more than once: each frame must be a single row`, {
        field: 'frame',
        value: kept[i].frame,
      });
    }
  }
  if (kept.length < MIN_FRAMES) {
    throw new CalcInputError(
      `only ${kept.length} usable frame(s) (of ${rows.length} rows): at least ${MIN_FRAMES} are needed for two increments`,
      { field: 'frames', value: kept.length },
    );
  }
  const gaps = findGaps(kept);
  if (gaps.length > 0) {
    warnings.push(
      `${gaps.length} gap(s) in the frame sequence (first after frame ${gaps[0].afterFrame}); ` +
        'each increment across a gap spans the missing frames',
    );
  }
  return { samples: kept, dropped, gaps, warnings };
}

function findGaps(samples: readonly RelativeSample[]): FrameGap[] {
  const steps = samples.slice(1).map((s, i) => s.frame - samples[i].frame);
  const typical = median(steps);
  const gaps: FrameGap[] = [];
  steps.forEach((step, i) => {
    if (step > 1.5 * typical) gaps.push({ afterFrame: samples[i].frame, beforeFrame: samples[i + 1].frame });
  });
  return gaps;
}

/**
 * Detect reversed point order. In tension the two sides of the neck separate along the loading
 * axis, so point 2 (by convention on the +x side) must end up at larger x relative to point 1. If the
 * net relative x displacement is negative the points were entered the other way round; the series is
 * negated (equivalent to swapping the points), which turns every angle by 180°.
 * @param samples relative history in frame order
 * @returns the corrected series, whether it was reversed, and a warning when the order is undecidable
 * @example orientForTension([{ frame: 0, dx: 0, dy: 0 }, { frame: 1, dx: -1, dy: 0 }]).reversed // true
 */
export function orientForTension(samples: readonly RelativeSample[]): {
  samples: RelativeSample[];
  reversed: boolean;
  warning: string | null;
} {
  const first = samples[0];
  const last = samples[samples.length - 1];
  const netX = last.dx - first.dx;
  const netY = last.dy - first.dy;
  const scale = Math.hypot(netX, netY);
  if (!(scale > 0) || Math.abs(netX) <= 1e-9 * scale) {
    return {
      samples: [...samples],
      reversed: false,
      warning: 'no net relative displacement along the loading axis: point order could not be checked',
    };
  }
  if (netX > 0) return { samples: [...samples], reversed: false, warning: null };
  return {
    samples: samples.map((s) => ({ frame: s.frame, dx: -s.dx, dy: -s.dy })),
    reversed: true,
    warning:
      'point 2 moved towards −x relative to point 1, which in tension means the points are in reversed order: ' +
      'they have been swapped (every angle turns by 180°)',
  };
}
