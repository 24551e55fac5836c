import { CalcInputError } from './errors';
import { type HillCoefficients } from './hill48';
import { type MeasuredNeck, solveHFromAngle, solveNormalAnisotropyFromAngle } from './neck-angle-inverse';
import { NECK_ASSUMPTIONS } from './neck-angle';
import { CALC_VERSION } from './version';

/*
 * Derived response "estimated H": each run's relative-displacement angle (from displacement-angle.ts,
 * maximum or plateau as the user chose) and its specimen's neck angle, turned into Hill's H through
 * the imposed-neck relation. A run whose angle is inadmissible gets a null H and the reason, so one bad
 * specimen does not block the study's analysis.
 */

/** How the other coefficients are fixed while H is solved. */
export type HAssumption =
  | { readonly kind: 'normal-anisotropy' }
  | { readonly kind: 'given-FGN'; readonly F: number; readonly G: number; readonly N: number };

/** One run's input. */
export interface RunAngle extends MeasuredNeck {
  readonly runId: string;
}

/** One run's estimate. */
export interface RunHEstimate {
  readonly runId: string;
  /** H normalised with G + H = 1 (the scale the r-value relations use); null if not solvable */
  readonly H: number | null;
  /** The full normalised coefficient set; null if not solvable */
  readonly coefficients: HillCoefficients | null;
  /** r under normal anisotropy, null otherwise or if not solvable */
  readonly r: number | null;
  /** why H is null */
  readonly error: string | null;
}

export interface HEstimateSet {
  readonly calcVersion: string;
  readonly assumption: HAssumption;
  readonly method: string;
  readonly assumptions: readonly string[];
  readonly cautions: readonly string[];
  readonly estimates: readonly RunHEstimate[];
}

export const H_ESTIMATE_CAUTIONS: readonly string[] = Object.freeze([
  'Notched and grooved strips are not standard tensile specimens: H (and r) estimated here are not ' +
    'equivalent to values measured to the applicable test standard.',
  'The relation assumes a thin sheet, a rigid-plastic Hill 1948 material, an associated flow rule and ' +
    'uniform stress along the neck; results inform, and do not replace, qualified engineering judgement.',
]);

/**
 * Estimate H for one run.
 * @param run run id, neck angle θ, measured angle φ, optional load angle to RD
 * @param assumption normal anisotropy, or F, G, N given
 * @returns H normalised with G + H = 1, with the coefficient set
 * @throws {CalcInputError} if the angles or coefficients are inadmissible
 * @example estimateH({ runId: 'R1', neckAngleDeg: 54.7356103172, relativeDisplacementAngleDeg: 35.2643896828 }, { kind: 'normal-anisotropy' }).H // ≈ 0.5
 */
export function estimateH(run: RunAngle, assumption: HAssumption): RunHEstimate {
  if (assumption.kind === 'normal-anisotropy') {
    const s = solveNormalAnisotropyFromAngle(run);
    return { runId: run.runId, H: s.normalised.H, coefficients: s.normalised, r: s.r, error: null };
  }
  const s = solveHFromAngle(run, assumption);
  return { runId: run.runId, H: s.normalised.H, coefficients: s.normalised, r: null, error: null };
}

/**
 * Estimate H for every run of a study. Runs with a missing angle or an inadmissible one get H = null
 * and the reason; other errors propagate.
 * @param runs one entry per run (angle may be NaN/null-like when the run has no derived angle yet)
 * @param assumption normal anisotropy, or F, G, N given
 * @returns the estimates with method, assumptions, cautions and CALC_VERSION
 * @throws {CalcInputError} if the given F, G or N are not positive (checked once, before any run)
 * @example estimateHForRuns(runs, { kind: 'given-FGN', F: 0.3, G: 0.35, N: 1.2 }).estimates[0].H
 */
export function estimateHForRuns(runs: readonly RunAngle[], assumption: HAssumption): HEstimateSet {
  if (assumption.kind === 'given-FGN') {
    for (const [k, v] of [['F', assumption.F], ['G', assumption.G], ['N', assumption.N]] as const) {
      if (!(typeof v === 'number' && Number.isFinite(v) && v > 0)) {
        throw new CalcInputError(`${k} = ${String(v)} is not admissible (given Hill coefficients must be > 0)`, { field: k, value: v });
      }
    }
  }
  const estimates = runs.map((run): RunHEstimate => {
    if (!Number.isFinite(run.relativeDisplacementAngleDeg)) {
      return { runId: run.runId, H: null, coefficients: null, r: null, error: 'no relative-displacement angle derived for this run yet' };
    }
    try {
      return estimateH(run, assumption);
    } catch (e) {
      // Expected: CalcInputError for an angle pair with no admissible H; anything else is a bug and propagates.
      if (!(e instanceof CalcInputError)) throw e;
      return { runId: run.runId, H: null, coefficients: null, r: null, error: e.message };
    }
  });
  const method =
    assumption.kind === 'normal-anisotropy'
      ? 'imposed-neck relation (Hill 1952 localized necking, Hill 1948 flow rule), normal anisotropy F = G, N = G + 2H, solved for r in closed form'
      : 'imposed-neck relation (Hill 1952 localized necking, Hill 1948 flow rule), F, G, N given, solved for H in closed form; H reported with G + H = 1';
  return { calcVersion: CALC_VERSION, assumption, method, assumptions: NECK_ASSUMPTIONS, cautions: H_ESTIMATE_CAUTIONS, estimates };
}
