import { describe, expect, it } from 'vitest';
import { CalcInputError } from './errors';
import { DISPLACEMENT_ANGLE_DEFAULTS, type PointFrame, relativeDisplacementAngle } from './displacement-angle';
import { CALC_VERSION } from './version';

/*
 * Synthetic histories from a prescribed rigid relative motion: point 2 moves relative to point 1 by
 * steps of fixed length whose directions follow ANGLES; both points also share a common motion (strip
 * translation and stretch) that must cancel. The exact answer is ANGLES itself (constructed, no source).
 */
const STEP = 0.02; // mm per frame
const ANGLES: number[] = [
  ...Array.from({ length: 10 }, (_, i) => 20 + 2.5 * i), // 20 … 42.5° while the neck forms
  45, // early maximum, increment 11 (frames 10 → 11)
  41,
  38,
  ...Array.from({ length: 47 }, () => 35), // plateau, increments 14 … 60 (frames 13 → 60)
];

function history(angles: readonly number[] = ANGLES): PointFrame[] {
  const rows: PointFrame[] = [];
  let dx = 1.5; // initial gauge offset of point 2 from point 1 (mm): irrelevant to increments
  let dy = -0.3;
  for (let k = 0; k <= angles.length; k++) {
    if (k > 0) {
      const a = (angles[k - 1] * Math.PI) / 180;
      dx += STEP * Math.cos(a);
      dy += STEP * Math.sin(a);
    }
    const cx = 0.05 * k + 0.001 * k * k; // common motion of both points
    const cy = -0.01 * k;
    rows.push({ frame: k, u1x: cx, u1y: cy, u2x: cx + dx - 1.5, u2y: cy + dy + 0.3 });
  }
  return rows;
}

/** Seeded PRNG (mulberry32) with Box-Muller, so the noisy case is reproducible. */
function gaussian(seed: number): () => number {
  let s = seed >>> 0;
  const uniform = (): number => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

describe('relativeDisplacementAngle on an exact rigid relative motion', () => {
  const res = relativeDisplacementAngle(history());

  it('recovers every increment angle exactly and cancels the common motion', () => {
    expect(res.curve).toHaveLength(ANGLES.length);
    res.curve.forEach((inc, i) => expect(inc.angleDeg).toBeCloseTo(ANGLES[i], 10));
    expect(res.curve[0].relativeDisplacement).toBeCloseTo(STEP, 12);
    expect(res.curve[ANGLES.length - 1].pathLength).toBeCloseTo(STEP * ANGLES.length, 12);
  });

  it('finds the early maximum and the plateau after it', () => {
    expect(res.maximum?.angleDeg).toBeCloseTo(45, 10);
    expect(res.maximum?.fromFrame).toBe(10);
    expect(res.maximum?.toFrame).toBe(11);
    expect(res.plateau?.startFrame).toBe(13);
    expect(res.plateau?.endFrame).toBe(60);
    expect(res.plateau?.increments).toBe(47);
    expect(res.plateau?.meanAngleDeg).toBeCloseTo(35, 10);
    expect(res.reversedOrder).toBe(false);
    expect(res.orientation).toBe(1);
  });

  it('returns parameters with defaults, conventions and the engine version', () => {
    expect(res.parameters).toEqual(DISPLACEMENT_ANGLE_DEFAULTS);
    expect(res.calcVersion).toBe(CALC_VERSION);
    expect(res.signConvention).toMatch(/atan2\(Δy, Δx\)/);
    expect(res.framesUsed).toHaveLength(61);
    expect(res.warnings).toEqual([]);
  });

  it('ignores increments before the relative displacement threshold', () => {
    // After k increments of the first, nearly straight part the net displacement is just under k·STEP.
    const r = relativeDisplacementAngle(history(), { minRelativeDisplacement: 5.5 * STEP });
    const ignored = r.curve.filter((c) => c.status === 'below-threshold');
    expect(ignored.map((c) => c.toFrame)).toEqual([1, 2, 3, 4, 5]);
    expect(r.framesUsed[0]).toBe(5);
    expect(r.maximum?.angleDeg).toBeCloseTo(45, 10);
  });

  it('widening the band merges the 38° increment into the plateau', () => {
    const r = relativeDisplacementAngle(history(), { plateauHalfBandDeg: 1.6 });
    expect(r.plateau?.startFrame).toBe(12);
    expect(r.plateau?.increments).toBe(48);
  });
});

describe('robustness to real-data defects', () => {
  it('drops NaN rows, reports gaps, and keeps the exact plateau angle', () => {
    const rows = history().filter((r) => ![30, 31, 45].includes(r.frame));
    rows[40] = { ...rows[40], u1x: Number.NaN };
    const res = relativeDisplacementAngle(rows);
    expect(res.droppedRows).toHaveLength(1);
    expect(res.droppedRows[0].frame).toBe(42);
    expect(res.gaps.map((g) => [g.afterFrame, g.beforeFrame])).toEqual([[29, 32], [41, 43], [44, 46]]);
    expect(res.curve.filter((c) => c.spansGap)).toHaveLength(3);
    expect(res.plateau?.meanAngleDeg).toBeCloseTo(35, 10);
    expect(res.plateau?.endFrame).toBe(60);
    expect(res.warnings.join(' ')).toMatch(/1 row\(s\) dropped/);
    expect(res.warnings.join(' ')).toMatch(/3 gap\(s\)/);
  });

  it('detects and corrects reversed point order', () => {
    const swapped = history().map((r) => ({ frame: r.frame, u1x: r.u2x, u1y: r.u2y, u2x: r.u1x, u2y: r.u1y }));
    const res = relativeDisplacementAngle(swapped);
    expect(res.reversedOrder).toBe(true);
    expect(res.warnings.join(' ')).toMatch(/reversed order/);
    expect(res.plateau?.meanAngleDeg).toBeCloseTo(35, 10);
    expect(res.maximum?.angleDeg).toBeCloseTo(45, 10);
    // Without the check the angles stay 180° off.
    const raw = relativeDisplacementAngle(swapped, { detectReversedOrder: false });
    expect(raw.curve[20].angleDeg).toBeCloseTo(35 - 180, 10);
  });

  it('reports a neck inclined the other way as negative orientation', () => {
    const res = relativeDisplacementAngle(history(ANGLES.map((a) => -a)));
    expect(res.orientation).toBe(-1);
    expect(res.maximum?.angleDeg).toBeCloseTo(-45, 10);
    expect(res.plateau?.meanAngleDeg).toBeCloseTo(-35, 10);
  });

  it('sorts unsorted frames with a warning', () => {
    const rows = history();
    [rows[3], rows[4]] = [rows[4], rows[3]];
    const res = relativeDisplacementAngle(rows);
    expect(res.warnings.join(' ')).toMatch(/sorted/);
    expect(res.curve[3].angleDeg).toBeCloseTo(ANGLES[3], 10);
  });

  it('recovers the plateau angle from noisy data with median smoothing', () => {
    // Noise sd 1e-4 mm per coordinate: the relative increment then carries sd 2e-4 mm per component,
    // so the raw angle scatters by about 2e-4/0.02 rad ≈ 0.6°; the plateau mean of ~45 increments has a
    // standard error near 0.1° and 0.3° allows three of them (common practice, no source).
    const noise = gaussian(20240607);
    const sd = 1e-4;
    const rows = history().map((r) => ({
      frame: r.frame,
      u1x: r.u1x + sd * noise(),
      u1y: r.u1y + sd * noise(),
      u2x: r.u2x + sd * noise(),
      u2y: r.u2y + sd * noise(),
    }));
    const rough = relativeDisplacementAngle(rows, { plateauHalfBandDeg: 1 });
    const smooth = relativeDisplacementAngle(rows, { smoothingWindow: 5, plateauHalfBandDeg: 1 });
    expect(smooth.parameters.smoothingWindow).toBe(5);
    expect(smooth.plateau).not.toBeNull();
    expect(Math.abs((smooth.plateau?.meanAngleDeg ?? 0) - 35)).toBeLessThan(0.3);
    // Smoothing must narrow the scatter: the ±1° plateau grows (it may not shrink).
    expect(smooth.plateau?.increments ?? 0).toBeGreaterThan(rough.plateau?.increments ?? 0);
    expect(smooth.maximum?.angleDeg).toBeGreaterThan(38);
  });
});

describe('bad input', () => {
  it('refuses duplicate frames, too few frames and bad options, naming the value', () => {
    const rows = history();
    expect(() => relativeDisplacementAngle([...rows, rows[7]])).toThrow(/frame 7 occurs more than once/);
    expect(() => relativeDisplacementAngle(rows.slice(0, 2))).toThrow(/only 2 usable frame/);
    expect(() => relativeDisplacementAngle(rows, { smoothingWindow: 4 })).toThrow(/smoothingWindow = 4 must be odd/);
    expect(() => relativeDisplacementAngle(rows, { plateauHalfBandDeg: 0 })).toThrow(/plateauHalfBandDeg = 0/);
    expect(() => relativeDisplacementAngle(rows, { minRelativeDisplacement: -1 })).toThrow(/minRelativeDisplacement = -1 is negative/);
    expect(() => relativeDisplacementAngle(rows, { minPlateauIncrements: 1 })).toThrow(CalcInputError);
  });

  it('leaves out increments of zero length (no direction) and says so', () => {
    const rows = history();
    rows[8] = { ...rows[8], u1x: rows[7].u1x, u1y: rows[7].u1y, u2x: rows[7].u2x, u2y: rows[7].u2y };
    const res = relativeDisplacementAngle(rows);
    expect(res.curve[7].status).toBe('zero-length');
    expect(Number.isNaN(res.curve[7].angleDeg)).toBe(true);
    expect(res.warnings.join(' ')).toMatch(/1 increment\(s\) of zero length/);
    expect(() => relativeDisplacementAngle(history().slice(0, 4), { smoothingWindow: 5 })).toThrow(/smoothingWindow = 5 is longer/);
  });

  it('says so when nothing reaches the threshold, or no plateau exists', () => {
    const none = relativeDisplacementAngle(history(), { minRelativeDisplacement: 100 });
    expect(none.maximum).toBeNull();
    expect(none.warnings.join(' ')).toMatch(/no increment reaches minRelativeDisplacement = 100/);
    const zigzag = relativeDisplacementAngle(history(ANGLES.map((_, i) => (i % 2 === 0 ? 10 : 40))));
    expect(zigzag.plateau).toBeNull();
    expect(zigzag.warnings.join(' ')).toMatch(/no plateau/);
  });
});
