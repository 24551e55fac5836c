/**
 * Power of the F tests of a planned factorial design, and the smallest replicate count that reaches
 * a target power — before any specimen is tested.
 *
 * Model: a full factorial with N = r * Π L_i runs (r replicates), optional complete blocks, and the
 * chosen model terms. For a term T with degrees of freedom df_T = Π_{i in T} (L_i - 1), the F test
 * statistic MS_T / MS_error is noncentral F(df_T, df_error, λ) under the alternative, with
 *
 *   λ = N f²,   f = σ_T / σ   (Cohen's f of the term: root mean square of the term's effects over
 *                              its cells, divided by the error standard deviation)
 *
 * because every cell of T holds N / cells(T) runs and λ = Σ_runs effect² / σ². For one factor with
 * k levels and n per level this is Cohen's λ = k n f² (the convention of power-oneway.json).
 *
 * Smallest difference Δ between level means (main effects only): among all configurations of a
 * levels whose largest and smallest means differ by Δ, the one with the least power is two levels
 * at μ ± Δ/2 and the others at μ (Cohen 1988, §8.2, "minimum variability" pattern). Its effects
 * are +Δ/2, -Δ/2 and a - 2 zeros, so σ_T² = 2 (Δ/2)² / a = Δ² / (2a) and f = Δ / (σ √(2a)).
 * Any other configuration with the same range has at least this power, so the figure is a floor.
 * For interaction terms a single "difference between level means" does not define the effect
 * pattern; they need Cohen's f, and otherwise get `power: null` with a note.
 *
 * Two-level fractions 2^(k-p) (`fraction: p`): N = r 2^(k-p) runs, every term has 1 df and the caller
 * lists the model terms — the ones the fraction estimates apart from each other (for a model of main
 * effects and two-factor interactions: designs/fractional-factorial.ts clearEffects). The columns of a
 * regular fraction are orthogonal and balanced (N/2 runs at each sign), so λ = N f² holds as for the
 * full factorial, and Δ keeps its meaning: the difference between the means at the factor's two levels
 * (the factor's "effect" in the two-level sense), f = Δ/(2σ), λ = N Δ²/(4σ²) (Montgomery, Design and
 * Analysis of Experiments, ch. 6-8, from memory). A term's test is the test of the term together with
 * its aliases.
 *
 * Caution: power is only as good as the guessed σ and effect; it plans a study, it does not
 * replace engineering judgement or a test standard's own sample-size rules.
 */
import { fUpperQuantile } from './distributions.js';
import { StatsInputError } from './errors.js';
import { noncentralFUpperTail } from './noncentral-f.js';

/** A factor of the planned design: its name and number of levels. */
export interface PlannedFactor {
  name: string;
  levels: number;
}

/** A planned full factorial, or a two-level 2^(k-p) fraction of one. */
export interface PowerPlan {
  factors: PlannedFactor[];
  /** replicates of the whole factorial (>= 1) */
  replicates: number;
  /** complete blocks: 'perReplicate' (one block per replicate) or a count dividing `replicates`; default none */
  blocks?: 'perReplicate' | number;
  /** model terms as lists of factor names; default all main effects and all interactions */
  terms?: string[][];
  /** significance level, default 0.05 */
  alpha?: number;
  /**
   * p of a two-level fraction 2^(k-p) (0 = the full factorial): each replicate has 2^(k-p) runs. Needs
   * two levels per factor and explicit `terms` that the fraction estimates apart from each other —
   * this function cannot see the generators, so choosing them is the caller's job.
   */
  fraction?: number;
}

/** The effect to detect: Cohen's f, or the smallest difference Δ between level means with expected σ. */
export type PlannedEffect = { kind: 'cohenF'; f: number } | { kind: 'difference'; delta: number; sigma: number };

/** Power of one term's F test. */
export interface TermPower {
  term: string;
  df: number;
  dfError: number;
  /** Cohen's f used (null when it cannot be derived for this term) */
  cohenF: number | null;
  ncp: number | null;
  fCrit: number;
  power: number | null;
  note?: string;
}

/**
 * Cohen's f of the least favourable configuration with range Δ among a level means: f = Δ/(σ√(2a)).
 * @throws StatsInputError for Δ <= 0, σ <= 0 or fewer than 2 levels
 * @example cohenFFromDifference(2, 1, 2) // 1: two levels at ±1 σ, σ_T = 1 σ
 */
export function cohenFFromDifference(delta: number, sigma: number, levels: number): number {
  if (!(delta > 0) || !Number.isFinite(delta)) throw new StatsInputError(`difference must be > 0, got ${delta}`, delta);
  if (!(sigma > 0) || !Number.isFinite(sigma)) throw new StatsInputError(`sigma must be > 0, got ${sigma}`, sigma);
  if (!Number.isInteger(levels) || levels < 2) throw new StatsInputError(`levels must be an integer >= 2, got ${levels}`, levels);
  return delta / (sigma * Math.sqrt(2 * levels));
}

function checkAlpha(alpha: number): void {
  if (!(alpha > 0 && alpha < 1)) throw new StatsInputError(`alpha must be between 0 and 1, got ${alpha}`, alpha);
}

function checkEffect(effect: PlannedEffect): void {
  if (effect.kind === 'cohenF' && !(effect.f >= 0 && Number.isFinite(effect.f))) {
    throw new StatsInputError(`Cohen's f must be a finite number >= 0, got ${effect.f}`, effect.f);
  }
}

/**
 * Power of the one-way fixed-effects ANOVA F test: k groups of n, Cohen's f, level alpha.
 * @throws StatsInputError for k < 2, n < 2, f < 0 or alpha outside (0, 1)
 * @example oneWayPower(3, 10, 0.25) // 0.1951400680194053 (mpmath, power-oneway.json)
 */
export function oneWayPower(groups: number, replicates: number, f: number, alpha = 0.05): number {
  if (!Number.isInteger(groups) || groups < 2) throw new StatsInputError(`groups must be an integer >= 2, got ${groups}`, groups);
  if (!Number.isInteger(replicates) || replicates < 2) {
    throw new StatsInputError(`replicates must be an integer >= 2 (one run per group leaves no error df), got ${replicates}`, replicates);
  }
  const rows = factorialPower({ factors: [{ name: 'A', levels: groups }], replicates, alpha }, { kind: 'cohenF', f });
  return rows[0].power as number;
}

function resolveTerms(plan: PowerPlan): string[][] {
  const names = plan.factors.map((x) => x.name);
  if (plan.terms === undefined) {
    // every non-empty subset, ordered by size then by factor order (A, B, A:B, ...)
    const all: string[][] = [];
    for (let mask = 1; mask < 1 << names.length; mask++) all.push(names.filter((_, i) => mask & (1 << i)));
    return all.sort((p, q) => p.length - q.length);
  }
  const seen = new Set<string>();
  for (const term of plan.terms) {
    if (term.length === 0) throw new StatsInputError('a model term must name at least one factor', term);
    for (const n of term) if (!names.includes(n)) throw new StatsInputError(`term names unknown factor "${n}"`, n);
    if (new Set(term).size !== term.length) throw new StatsInputError(`term "${term.join(':')}" names a factor twice`, term);
    const key = [...term].sort().join(':');
    if (seen.has(key)) throw new StatsInputError(`term "${term.join(':')}" is listed twice`, term);
    seen.add(key);
  }
  return plan.terms;
}

function checkPlan(plan: PowerPlan): void {
  if (plan.factors.length === 0) throw new StatsInputError('the plan needs at least one factor', plan.factors);
  const seen = new Set<string>();
  for (const f of plan.factors) {
    if (seen.has(f.name)) throw new StatsInputError(`factor "${f.name}" is named twice`, f.name);
    seen.add(f.name);
    if (!Number.isInteger(f.levels) || f.levels < 2) {
      throw new StatsInputError(`factor "${f.name}" needs an integer number of levels >= 2, got ${f.levels}`, f.levels);
    }
  }
  if (!Number.isInteger(plan.replicates) || plan.replicates < 1) {
    throw new StatsInputError(`replicates must be an integer >= 1, got ${plan.replicates}`, plan.replicates);
  }
  const p = plan.fraction;
  if (p !== undefined) {
    const k = plan.factors.length;
    if (!Number.isInteger(p) || p < 0 || (p > 0 && p > k - 2)) throw new StatsInputError(`a 2^(${k}-p) fraction needs an integer p from 0 to ${Math.max(0, k - 2)}, got ${p}`, p);
    const multi = plan.factors.find((f) => f.levels !== 2);
    if (multi) throw new StatsInputError(`factor "${multi.name}" has ${multi.levels} levels; a 2^(k-p) fraction needs exactly 2`, multi.name);
    if (p > 0 && plan.terms === undefined) throw new StatsInputError('a fraction needs its model terms listed (the effects it estimates apart from each other)', p);
  }
  const b = plan.blocks;
  if (typeof b === 'number' && (!Number.isInteger(b) || b < 1 || plan.replicates % b !== 0)) {
    throw new StatsInputError(`blocks must be a whole number dividing the ${plan.replicates} replicates, got ${b}`, b);
  }
}

/**
 * Power of the F test of each model term of a planned full factorial or 2^(k-p) fraction.
 * @param plan factors with level counts, replicates, blocks, model terms, alpha, fraction p
 * @param effect Cohen's f (applied to every term) or Δ with σ (main effects only)
 * @returns one row per term with df, error df, f, λ, critical F and power
 * @throws StatsInputError for bad plans, or when the model leaves no error degrees of freedom
 * @example factorialPower({factors: [{name: 'A', levels: 3}], replicates: 10}, {kind: 'cohenF', f: 0.25})[0].power // 0.19514
 */
export function factorialPower(plan: PowerPlan, effect: PlannedEffect): TermPower[] {
  checkPlan(plan);
  checkEffect(effect);
  const alpha = plan.alpha ?? 0.05;
  checkAlpha(alpha);
  const terms = resolveTerms(plan);
  const levelsOf = new Map(plan.factors.map((f) => [f.name, f.levels]));
  const cells = plan.factors.reduce((p, f) => p * f.levels, 1) / 2 ** (plan.fraction ?? 0);
  const n = cells * plan.replicates;
  const blocks = plan.blocks === 'perReplicate' ? plan.replicates : (plan.blocks ?? 1);
  const dfOf = (term: string[]): number => term.reduce((p, name) => p * ((levelsOf.get(name) as number) - 1), 1);
  const dfModel = terms.reduce((s, t) => s + dfOf(t), 0);
  const dfError = n - 1 - (blocks - 1) - dfModel;
  if (dfError < 1) {
    throw new StatsInputError(
      `the plan leaves ${dfError} error degrees of freedom (${n} runs, ${blocks} blocks, ${dfModel} model df): add replicates or drop ${plan.fraction ? 'model terms' : 'high-order interactions'}`,
      dfError,
    );
  }
  return terms.map((term) => {
    const df = dfOf(term);
    const fCrit = fUpperQuantile(alpha, df, dfError);
    const row = { term: term.join(':'), df, dfError, fCrit };
    let f: number;
    if (effect.kind === 'cohenF') f = effect.f;
    else if (term.length === 1) f = cohenFFromDifference(effect.delta, effect.sigma, levelsOf.get(term[0]) as number);
    else return { ...row, cohenF: null, ncp: null, power: null, note: 'a difference between level means defines main effects only; give Cohen\'s f for interactions' };
    const ncp = n * f * f;
    return { ...row, cohenF: f, ncp, power: noncentralFUpperTail(fCrit, df, dfError, ncp) };
  });
}

/** Result of the replicate search. */
export interface ReplicateSearch {
  /** smallest replicate count at which every requested term reaches the target */
  replicates: number;
  /** the power table at that replicate count */
  powers: TermPower[];
}

/**
 * Smallest number of replicates for which the F test of each chosen term reaches `targetPower`.
 * Power grows with replicates (λ grows linearly, the critical F falls), so the first count found
 * scanning upwards is the answer.
 * @param plan the design; its `replicates` is ignored
 * @param termNames the terms that must reach the target, written "A" or "A:B" (default: all terms with a power)
 * @throws StatsInputError for a target outside (0, 1), an unknown term, or when maxReplicates is not enough
 * @example replicatesForPower({factors: [{name: 'A', levels: 3}], replicates: 1}, {kind: 'cohenF', f: 0.4}, 0.8).replicates // 22
 */
export function replicatesForPower(
  plan: PowerPlan,
  effect: PlannedEffect,
  targetPower: number,
  termNames?: string[],
  maxReplicates = 1000,
): ReplicateSearch {
  if (!(targetPower > 0 && targetPower < 1)) {
    throw new StatsInputError(`target power must be between 0 and 1, got ${targetPower}`, targetPower);
  }
  for (let r = 1; r <= maxReplicates; r++) {
    const candidate: PowerPlan = { ...plan, replicates: r };
    if (typeof plan.blocks === 'number' && r % plan.blocks !== 0) continue;
    let powers: TermPower[];
    try {
      powers = factorialPower(candidate, effect);
    } catch (err) {
      // Expected: too few replicates leave no error df; any other bad input is rethrown.
      if (err instanceof StatsInputError && /error degrees of freedom/.test(err.message)) continue;
      throw err;
    }
    const chosen = termNames ?? powers.filter((p) => p.power !== null).map((p) => p.term);
    const reached = chosen.every((name) => {
      const row = powers.find((p) => p.term === name);
      if (!row) throw new StatsInputError(`unknown term "${name}"`, name);
      if (row.power === null) throw new StatsInputError(`term "${name}" has no power for this effect: ${row.note}`, name);
      return row.power >= targetPower;
    });
    if (reached) return { replicates: r, powers };
  }
  throw new StatsInputError(`target power ${targetPower} is not reached within ${maxReplicates} replicates`, maxReplicates);
}
