import type { PlanBody } from '../../shared/runs.js';
import { HttpError } from '../http-error.js';
import { StatsInputError } from '../stats/errors.js';
import { clearEffects, fractionalFactorial, type FractionalDesign, type TwoLevelFactor } from '../stats/designs/fractional-factorial.js';
import { fullFactorial, type DesignFactor, type DesignRun, type Level } from '../stats/designs/full-factorial.js';
import { factorialPower, replicatesForPower, type PowerPlan, type TermPower } from '../stats/power.js';
import type { FactorRow, Setup } from './study-setup.js';

/**
 * Bridges a study's set-up to the design engine (server/stats/designs) and the power calculation
 * (server/stats/power.ts). The engine works on factor names and numeric or text levels; the study
 * keeps level values as the text the engineer typed ("0.50"), so levels go in as numbers for numeric
 * factors (centre points need arithmetic) and come back mapped to that exact text.
 *
 * Centre points (fractions, and full factorials whose factors are all numeric at two levels): that
 * many runs at the midpoint of every factor per block, or in total without blocks; standard order
 * after the factorial runs, randomised within their block with the rest (Montgomery, Design and
 * Analysis of Experiments, §6.8 "Addition of center points to the 2^k design", from memory). The
 * analysis leaves them out of the ANOVA, so power is computed on the factorial runs only.
 */

export interface GeneratedRun {
  standardOrder: number;
  runOrder: number;
  block: string;
  centrePoint: boolean;
  settings: Record<string, string>;
}
export interface GeneratedPlan {
  runs: GeneratedRun[];
  summary: Record<string, unknown>;
}

const levelIn = (f: FactorRow, value: string): Level => (f.kind === 'numeric' ? Number(value) : value);

function levelOut(f: FactorRow, v: Level): string {
  if (f.kind !== 'numeric') return String(v);
  const typed = f.levels.find((l) => Number(l.value) === Number(v));
  // A centre point lies between the typed levels: its text is the computed midpoint.
  return typed ? typed.value : String(Number(Number(v).toPrecision(12)));
}

function blocksOption(b: PlanBody['blocks']): 'perReplicate' | string[] | undefined {
  if (b === 'none') return undefined;
  if (b === 'perReplicate') return 'perReplicate';
  return Array.from({ length: b }, (_, i) => `Block ${i + 1}`);
}

const twoLevel = (factors: FactorRow[]): TwoLevelFactor[] =>
  factors.map((f) => ({ name: f.symbol, levels: [levelIn(f, f.levels[0]!.value), levelIn(f, f.levels[1]!.value)] }));

/** Why a full factorial of these factors cannot take centre points, or null when it can. */
function centreRefusal(factors: FactorRow[]): string | null {
  const categorical = factors.find((f) => f.kind !== 'numeric');
  if (categorical) return `factor "${categorical.symbol}" is categorical, so it has no midpoint`;
  const multi = factors.find((f) => f.levels.length !== 2);
  if (multi) return `factor "${multi.symbol}" has ${multi.levels.length} levels; give its middle value as a level instead`;
  return null;
}

function toRuns(factors: FactorRow[], runs: DesignRun[]): GeneratedRun[] {
  return runs.map((r) => ({
    standardOrder: r.standardOrder,
    runOrder: r.runOrder,
    block: r.block ?? '1',
    centrePoint: r.centre === true,
    settings: Object.fromEntries(factors.map((f) => [f.symbol, levelOut(f, r.levels[f.symbol]!)])),
  }));
}

/**
 * Power per term; notes instead of a failure when the plan leaves no error df. A fraction's model is
 * its main effects and the two-factor interactions it estimates apart from them (clearEffects).
 */
function powerSummary(factors: FactorRow[], body: PlanBody, notes: string[], fraction?: FractionalDesign): { power?: TermPower[]; replicatesForTarget?: number } {
  if (!body.power) return {};
  const plan: PowerPlan = {
    factors: factors.map((f) => ({ name: f.symbol, levels: f.levels.length })),
    replicates: body.replicates,
    blocks: body.blocks === 'none' ? undefined : body.blocks,
    alpha: body.power.alpha,
  };
  if (fraction) {
    const factorOf = new Map(fraction.letters.map((l) => [l.letter, l.factor]));
    const model = clearEffects(fraction.aliases);
    plan.fraction = fraction.p;
    plan.terms = model.map((m) => [...m.effect].map((letter) => factorOf.get(letter)!));
    const named = (word: string): string => (word.startsWith('-') ? '-' : '') + [...word.replace(/^-/, '')].map((l) => factorOf.get(l)).join(':');
    const interactions = model.filter((m) => m.effect.length === 2).map((m) => [m.effect, ...m.aliases].map(named).join(' = '));
    notes.push(
      `Power of the 2^(${fraction.k}-${fraction.p}) fraction is for the model of the main effects` +
        (interactions.length ? ` and the two-factor interactions clear of them (${interactions.join(', ')})` : ' only (no two-factor interaction is clear of them)') +
        '; each term is tested together with its aliases.',
    );
  }
  if (body.centrePoints > 0) notes.push('Power counts the factorial runs only: the analysis leaves the centre points out.');
  const out: { power?: TermPower[]; replicatesForTarget?: number } = {};
  try {
    out.power = factorialPower(plan, body.power.effect);
  } catch (err) {
    // Expected: one replicate of the full model leaves no error degrees of freedom; say so instead of failing the preview.
    if (!(err instanceof StatsInputError)) throw err;
    notes.push(`Power not available: ${err.message}`);
  }
  if (body.power.targetPower !== undefined) {
    try {
      out.replicatesForTarget = replicatesForPower(plan, body.power.effect, body.power.targetPower, undefined, 200).replicates;
    } catch (err) {
      // Expected when the target is out of reach within 200 replicates (or the effect defines no term's power).
      if (!(err instanceof StatsInputError)) throw err;
      notes.push(`Replicates for power ${body.power.targetPower}: ${err.message}`);
    }
  }
  return out;
}

export function generatePlan(setup: Setup, body: PlanBody): GeneratedPlan {
  const factors = setup.factors;
  if (factors.length === 0) throw new HttpError(400, 'The study has no factors yet: set up factors (PUT /api/studies/:id/factors) before planning');
  const notes: string[] = [];
  const common = { replicates: body.replicates, blocks: blocksOption(body.blocks), seed: body.seed, randomise: body.randomise };
  let runs: DesignRun[];
  let fractional: Record<string, unknown> = {};
  let fraction: FractionalDesign | undefined;
  if (body.design === 'full') {
    if (body.centrePoints > 0) {
      const why = centreRefusal(factors);
      if (why) {
        throw new HttpError(400, `centrePoints ${body.centrePoints}: a full factorial takes centre points only when every factor is numeric with exactly two levels (the centre is the midpoint of low and high); ${why}`, {
          details: [{ path: 'centrePoints', message: `Use 0: ${why}` }],
        });
      }
      // The full 2^k is the fraction with p = 0: its centre runs come from the same code as a fraction's.
      runs = fractionalFactorial({ factors: twoLevel(factors), generators: [], centrePoints: body.centrePoints, ...common }).runs;
    } else {
      const design: DesignFactor[] = factors.map((f) => ({ name: f.symbol, levels: f.levels.map((l) => levelIn(f, l.value)) }));
      runs = fullFactorial({ factors: design, ...common });
    }
  } else {
    const multi = factors.find((f) => f.levels.length !== 2);
    if (multi) throw new HttpError(400, `Factor "${multi.symbol}" has ${multi.levels.length} levels; a 2^(k-p) plan needs exactly 2 levels per factor`);
    const d = fractionalFactorial({ factors: twoLevel(factors), generators: body.fraction?.generators, fraction: body.fraction?.p, centrePoints: body.centrePoints, ...common });
    fraction = d;
    runs = d.runs;
    fractional = { k: d.k, p: d.p, letters: d.letters, generators: d.generators, definingRelation: d.definingRelation, resolution: d.resolution, wordLengthPattern: d.wordLengthPattern, aliases: d.aliases };
    if (d.resolution <= 3) notes.push(`Resolution ${d.resolution}: main effects are aliased with two-factor interactions; read the alias list before trusting a main effect.`);
  }
  if (body.replicates === 1) notes.push('One replicate: the error term comes from pooled high-order interactions only; replicate if you can.');
  const summary = {
    design: body.design,
    runCount: runs.length,
    factors: factors.map((f) => ({ symbol: f.symbol, levels: f.levels.map((l) => l.value) })),
    replicates: body.replicates,
    blocks: body.blocks,
    centrePoints: body.centrePoints,
    seed: body.seed,
    randomise: body.randomise,
    ...fractional,
    ...powerSummary(factors, body, notes, fraction),
    notes,
  };
  return { runs: toRuns(factors, runs), summary };
}
