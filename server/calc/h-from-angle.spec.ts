import { describe, expect, it } from 'vitest';
import { estimateH, estimateHForRuns, H_ESTIMATE_CAUTIONS } from './h-from-angle';
import { hillFromLankford } from './hill48';
import { predictRelativeDisplacementAngle } from './neck-angle';
import { CALC_VERSION } from './version';

const DEG = 180 / Math.PI;
// Hill 1952 isotropic pair: neck at arctan √2, relative displacement at 90° − ψ.
const PSI_ISO = Math.atan(Math.SQRT2) * DEG;

describe('estimateH', () => {
  it('gives H = 1/2 (G + H = 1) for the isotropic pair under normal anisotropy', () => {
    const e = estimateH({ runId: 'R1', neckAngleDeg: PSI_ISO, relativeDisplacementAngleDeg: 90 - PSI_ISO }, { kind: 'normal-anisotropy' });
    expect(e.H).toBeCloseTo(0.5, 12);
    expect(e.r).toBeCloseTo(1, 12);
  });

  it('recovers a known material’s H from angles it would produce (F, G, N given on their own scale)', () => {
    const c = hillFromLankford({ r0: 1.8, r45: 1.2, r90: 2.3 });
    const phi = predictRelativeDisplacementAngle(c, 58, 10).relativeDisplacementAngleDeg;
    const e = estimateH({ runId: 'R2', neckAngleDeg: 58, relativeDisplacementAngleDeg: phi, loadAngleDeg: 10 }, { kind: 'given-FGN', F: 2 * c.F, G: 2 * c.G, N: 2 * c.N });
    expect(e.H).toBeCloseTo(c.H, 12); // reported with G + H = 1, whatever the scale of F, G, N
    expect(e.r).toBeNull();
  });
});

describe('estimateHForRuns', () => {
  const runs = [
    { runId: 'A', neckAngleDeg: PSI_ISO, relativeDisplacementAngleDeg: 90 - PSI_ISO },
    { runId: 'B', neckAngleDeg: 60, relativeDisplacementAngleDeg: 10 }, // below the r → 0 limit 19.107° at θ = 60°
    { runId: 'C', neckAngleDeg: 60, relativeDisplacementAngleDeg: Number.NaN }, // not derived yet
  ];

  it('estimates each run, and keeps going past an inadmissible or missing angle with the reason', () => {
    const set = estimateHForRuns(runs, { kind: 'normal-anisotropy' });
    expect(set.calcVersion).toBe(CALC_VERSION);
    expect(set.cautions).toBe(H_ESTIMATE_CAUTIONS);
    expect(set.method).toMatch(/normal anisotropy/);
    expect(set.estimates.map((e) => e.runId)).toEqual(['A', 'B', 'C']);
    expect(set.estimates[0].H).toBeCloseTo(0.5, 12);
    expect(set.estimates[1].H).toBeNull();
    expect(set.estimates[1].error).toMatch(/relativeDisplacementAngleDeg = 10° admits no positive r/);
    expect(set.estimates[2].error).toMatch(/no relative-displacement angle/);
  });

  it('refuses non-positive given coefficients before touching any run', () => {
    expect(() => estimateHForRuns(runs, { kind: 'given-FGN', F: 0.5, G: -0.5, N: 1.5 })).toThrow(/G = -0.5 is not admissible/);
  });
});
