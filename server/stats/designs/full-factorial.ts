/**
 * Full factorial designs over mixed-level factors, with replicates, complete blocks, and a run
 * order randomised by a recorded seed (prng.ts). Standard order is kept beside run order.
 *
 * Standard order: Yates order generalised to mixed levels — the first factor changes fastest,
 * then the second, and so on (Box, Hunter & Hunter 2005, ch. 5); replicate r repeats the whole
 * list, so standard order number = (r - 1) * cells + cell index + 1.
 * Blocks: complete blocks, each holding whole replicates — either one block per replicate, or a
 * list of named blocks that must divide the replicates evenly. Randomisation is done within each
 * block (that is what makes the block a restriction on randomisation); blocks are run in order.
 */
import { StatsInputError } from '../errors.js';
import { mulberry32, shuffled } from './prng.js';

export type Level = string | number;

export interface DesignFactor {
  name: string;
  levels: Level[];
}

export interface DesignRun {
  /** 1-based position in the randomised sequence */
  runOrder: number;
  /** 1-based position in standard order */
  standardOrder: number;
  replicate: number;
  block: string | null;
  /** true for centre points (fractional designs) */
  centre?: boolean;
  levels: Record<string, Level>;
}

export interface FullFactorialOptions {
  factors: DesignFactor[];
  replicates?: number;
  /** 'perReplicate', or named blocks; default none */
  blocks?: 'perReplicate' | string[];
  seed: number;
  /** false keeps standard order as run order (e.g. hard-to-change factors; not recommended) */
  randomise?: boolean;
}

/** Validate factor names and levels (shared by the fractional designs). */
export function checkFactors(factors: DesignFactor[], minLevels = 2): void {
  if (!Array.isArray(factors) || factors.length === 0) throw new StatsInputError('a design needs at least one factor', factors);
  const names = new Set<string>();
  for (const f of factors) {
    if (typeof f.name !== 'string' || f.name.trim() === '') throw new StatsInputError(`factor name must be a non-empty string, got "${f.name}"`, f.name);
    if (names.has(f.name)) throw new StatsInputError(`factor "${f.name}" is named twice`, f.name);
    names.add(f.name);
    if (!Array.isArray(f.levels) || f.levels.length < minLevels) {
      throw new StatsInputError(`factor "${f.name}" needs at least ${minLevels} levels, got ${Array.isArray(f.levels) ? f.levels.length : f.levels}`, f.name);
    }
    const seen = new Set<string>();
    for (const l of f.levels) {
      if (typeof l === 'number' && !Number.isFinite(l)) throw new StatsInputError(`factor "${f.name}" has level ${l}`, l);
      if (seen.has(String(l))) throw new StatsInputError(`factor "${f.name}" lists level "${l}" twice`, l);
      seen.add(String(l));
    }
  }
}

/** Block label of each replicate (1-based), or null without blocking. */
export function blockOfReplicate(replicates: number, blocks: FullFactorialOptions['blocks']): (r: number) => string | null {
  if (blocks === undefined) return () => null;
  if (blocks === 'perReplicate') return (r) => `Block ${r}`;
  if (!Array.isArray(blocks) || blocks.length === 0) throw new StatsInputError(`blocks must be "perReplicate" or a list of names, got ${JSON.stringify(blocks)}`, blocks);
  if (new Set(blocks).size !== blocks.length) throw new StatsInputError(`a block name appears twice in ${blocks.join(', ')}`, blocks);
  if (replicates % blocks.length !== 0) {
    throw new StatsInputError(`${blocks.length} complete blocks need a replicate count divisible by ${blocks.length}, got ${replicates}`, replicates);
  }
  const perBlock = replicates / blocks.length;
  return (r) => blocks[Math.floor((r - 1) / perBlock)];
}

export function checkReplicates(replicates: number): void {
  if (!Number.isInteger(replicates) || replicates < 1) throw new StatsInputError(`replicates must be an integer >= 1, got ${replicates}`, replicates);
}

/**
 * Give runs (in standard order) a run order: shuffled within each block by mulberry32(seed).
 * Runs are returned sorted by run order.
 */
export function assignRunOrder(runs: Omit<DesignRun, 'runOrder'>[], seed: number, randomise = true): DesignRun[] {
  const random = mulberry32(seed);
  const blockNames = [...new Set(runs.map((r) => r.block))];
  const ordered = blockNames.flatMap((b) => {
    const inBlock = runs.filter((r) => r.block === b);
    return randomise ? shuffled(inBlock, random) : inBlock;
  });
  return ordered.map((r, i) => ({ runOrder: i + 1, ...r }));
}

/**
 * Full factorial design.
 * @param opts factors with their levels, replicates (default 1), blocks, seed, randomise (default true)
 * @returns runs sorted by run order, each with its standard order, replicate, block and levels
 * @throws StatsInputError for no factors, a factor named twice, fewer than two levels, a repeated level, bad replicates or blocks
 * @example fullFactorial({factors: [{name: 'radius', levels: [0.5, 1, 2]}, {name: 'angle', levels: [30, 60]}], replicates: 2, seed: 7})
 */
export function fullFactorial(opts: FullFactorialOptions): DesignRun[] {
  checkFactors(opts.factors);
  const replicates = opts.replicates ?? 1;
  checkReplicates(replicates);
  const blockOf = blockOfReplicate(replicates, opts.blocks);
  const cells = opts.factors.reduce((p, f) => p * f.levels.length, 1);
  if (cells * replicates > 1_000_000) throw new StatsInputError(`the design would have ${cells * replicates} runs; more than 1 000 000 is not a plan`, cells * replicates);
  const runs: Omit<DesignRun, 'runOrder'>[] = [];
  for (let r = 1; r <= replicates; r++) {
    for (let c = 0; c < cells; c++) {
      const levels: Record<string, Level> = {};
      let rest = c;
      for (const f of opts.factors) {
        levels[f.name] = f.levels[rest % f.levels.length];
        rest = Math.floor(rest / f.levels.length);
      }
      runs.push({ standardOrder: (r - 1) * cells + c + 1, replicate: r, block: blockOf(r), levels });
    }
  }
  return assignRunOrder(runs, opts.seed, opts.randomise ?? true);
}
