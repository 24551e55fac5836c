/**
 * Two-level fractional factorial designs 2^(k-p), k <= 11, from generators ("E=ABCD", or
 * "E=-ABCD" for the other half) given by the user or taken from the standard table
 * (generator-table.ts), with the defining relation, resolution, word-length pattern and alias
 * structure of main effects and two-factor interactions; optional centre points for numeric
 * factors. p = 0 (no generators) gives the full 2^k, so that a full two-level factorial gets its
 * centre points from the same code as a fraction.
 *
 * Algebra (Box, Hunter & Hunter 2005, ch. 6): a word is a set of letters, stored as a bit mask;
 * multiplying words is symmetric difference (A·A = I), i.e. XOR of masks, and signs multiply.
 * The p generator words E·ABCD = ABCDE ... generate the defining contrast subgroup of 2^p - 1
 * words; the resolution is the length of its shortest word; an effect's aliases are its products
 * with every word.
 */
import { StatsInputError } from '../errors.js';
import { assignRunOrder, blockOfReplicate, checkFactors, checkReplicates, type DesignRun, type Level } from './full-factorial.js';
import { STANDARD_GENERATORS } from './generator-table.js';

/** Factor letters: A..L without I (I denotes the identity). */
export const LETTERS = 'ABCDEFGHJKL';

export interface TwoLevelFactor {
  name: string;
  /** [low, high]; numbers allow centre points */
  levels: [Level, Level];
}

export interface FractionalOptions {
  factors: TwoLevelFactor[];
  /** generators like "E=ABCD" ([] for the full 2^k); when omitted, `fraction` (p) picks the standard ones */
  generators?: string[];
  /** p; 0 is the full 2^k */
  fraction?: number;
  replicates?: number;
  blocks?: 'perReplicate' | string[];
  /** centre points per block (or in total without blocks); numeric factors only */
  centrePoints?: number;
  seed: number;
  randomise?: boolean;
}

export interface Word {
  mask: number;
  sign: 1 | -1;
}

export interface FractionalDesign {
  k: number;
  p: number;
  letters: { letter: string; factor: string }[];
  generators: string[];
  /** "I = ABCE = ..." (every word of the defining contrast subgroup, with sign); "I" for p = 0 */
  definingRelation: string;
  /** length of the shortest defining word; Infinity for p = 0 (no defining word: nothing is aliased) */
  resolution: number;
  /** counts of defining words of length 1, 2, ..., k (index 0 = length 1) */
  wordLengthPattern: number[];
  /** main effects and two-factor interactions with their aliases of order <= 2 */
  aliases: { effect: string; aliases: string[] }[];
  runs: DesignRun[];
}

const popcount = (m: number): number => {
  let c = 0;
  for (let x = m; x; x &= x - 1) c++;
  return c;
};

export function wordName(mask: number): string {
  let s = '';
  for (let i = 0; i < LETTERS.length; i++) if (mask & (1 << i)) s += LETTERS[i];
  return s === '' ? 'I' : s;
}

/** Parse "E=ABCD" / "E = -ABCD" into the generated letter and the defining word E·ABCD. */
export function parseGenerator(text: string, k: number): { letter: number; word: Word } {
  const m = /^\s*([A-Z])\s*=\s*([+-]?)\s*([A-Z]+)\s*$/.exec(String(text).toUpperCase());
  if (!m) throw new StatsInputError(`generator "${text}" is not of the form E=ABCD`, text);
  const letters = LETTERS.slice(0, k);
  const index = (ch: string): number => {
    const i = letters.indexOf(ch);
    if (i < 0) throw new StatsInputError(`generator "${text}" uses letter "${ch}", which is not one of ${letters}`, ch);
    return i;
  };
  const lhs = index(m[1]);
  let rhs = 0;
  for (const ch of m[3]) {
    const bit = 1 << index(ch);
    if (rhs & bit) throw new StatsInputError(`generator "${text}" repeats letter "${ch}"`, ch);
    rhs |= bit;
  }
  if (rhs & (1 << lhs)) throw new StatsInputError(`generator "${text}" defines ${m[1]} in terms of itself`, text);
  if (popcount(rhs) < 2) throw new StatsInputError(`generator "${text}" would make ${m[1]} identical to a main effect`, text);
  return { letter: lhs, word: { mask: rhs | (1 << lhs), sign: m[2] === '-' ? -1 : 1 } };
}

/** All 2^p - 1 products of the generator words (the defining contrast subgroup). */
export function definingWords(words: Word[]): Word[] {
  const out: Word[] = [];
  for (let s = 1; s < 1 << words.length; s++) {
    let mask = 0;
    let sign = 1;
    words.forEach((w, i) => {
      if (s & (1 << i)) {
        mask ^= w.mask;
        sign *= w.sign;
      }
    });
    out.push({ mask, sign: sign as 1 | -1 });
  }
  return out;
}

/** Resolution and word-length pattern of a defining subgroup over k letters. */
export function wordLengths(words: Word[], k: number): { resolution: number; wordLengthPattern: number[] } {
  const pattern = new Array<number>(k).fill(0);
  for (const w of words) pattern[popcount(w.mask) - 1]++;
  // No word (the full 2^k): no effect is aliased with another, which is resolution "infinite".
  const resolution = words.length === 0 ? Infinity : Math.min(...words.map((w) => popcount(w.mask)));
  return { resolution, wordLengthPattern: pattern };
}

function resolveGenerators(opts: FractionalOptions, k: number): string[] {
  if (opts.generators !== undefined) return opts.generators;
  const p = opts.fraction;
  if (!Number.isInteger(p) || (p as number) < 0) throw new StatsInputError(`give generators or a fraction p >= 0 (0 is the full 2^k), got ${p}`, p);
  if (p === 0) return [];
  const entry = STANDARD_GENERATORS.find((e) => e.k === k && e.p === p);
  if (!entry) throw new StatsInputError(`no standard 2^(${k}-${p}) design in the table; give generators`, p);
  return entry.generators;
}

/**
 * Two-level fractional factorial design from generators; no generators (or fraction 0) gives the full 2^k.
 * @throws StatsInputError for k > 11, non-two-level factors, unknown letters, repeated or dependent generators,
 *   a fraction of fewer than 3 factors, centre points with a categorical factor
 * @example fractionalFactorial({factors: five, generators: ['E=ABCD'], seed: 1}).resolution // 5
 * @example fractionalFactorial({factors: three, generators: [], centrePoints: 3, seed: 1}).runs.length // 8 + 3
 */
export function fractionalFactorial(opts: FractionalOptions): FractionalDesign {
  checkFactors(opts.factors);
  const k = opts.factors.length;
  if (k > LETTERS.length) throw new StatsInputError(`two-level designs from generators (fractions, or a full 2^k with centre points) support at most 11 factors, got ${k}`, k);
  for (const f of opts.factors) {
    if (f.levels.length !== 2) throw new StatsInputError(`factor "${f.name}" must have exactly 2 levels, got ${f.levels.length}`, f.name);
  }
  const generators = resolveGenerators(opts, k);
  if (generators.length > 0 && k < 3) throw new StatsInputError(`a fractional factorial needs at least 3 factors, got ${k}`, k);
  const parsed = generators.map((g) => parseGenerator(g, k));
  const generated = new Set<number>();
  for (const [i, g] of parsed.entries()) {
    if (generated.has(g.letter)) throw new StatsInputError(`generator "${generators[i]}" defines ${LETTERS[g.letter]} a second time`, generators[i]);
    generated.add(g.letter);
  }
  for (const [i, g] of parsed.entries()) {
    const rhs = g.word.mask & ~(1 << g.letter);
    for (const l of generated) {
      if (rhs & (1 << l)) throw new StatsInputError(`generator "${generators[i]}" uses generated letter ${LETTERS[l]}; use base factors only`, generators[i]);
    }
  }
  const p = parsed.length;
  if (p > 0 && p > k - 2) throw new StatsInputError(`a 2^(${k}-p) design needs 1 <= p <= ${k - 2} generators, got ${p}`, p);
  const words = definingWords(parsed.map((g) => g.word));
  const base = [...Array(k).keys()].filter((i) => !generated.has(i));
  parsed.forEach((g, i) => {
    const rhs = g.word.mask & ~(1 << g.letter);
    const j = parsed.findIndex((h) => (h.word.mask & ~(1 << h.letter)) === rhs);
    if (j !== i) throw new StatsInputError(`generators "${generators[j]}" and "${generators[i]}" repeat the same word, so their factors would be identical`, generators[i]);
  });
  const { resolution, wordLengthPattern } = wordLengths(words, k);
  const definingRelation = ['I', ...words.map((w) => `${w.sign < 0 ? '-' : ''}${wordName(w.mask)}`)];
  const aliases = aliasStructure(words, k);
  const runs = buildRuns(opts, base, parsed);
  return {
    k, p,
    letters: opts.factors.map((f, i) => ({ letter: LETTERS[i], factor: f.name })),
    generators, definingRelation: definingRelation.join(' = '), resolution, wordLengthPattern, aliases, runs,
  };
}

/**
 * The effects a 2^(k-p) design estimates apart from each other in a model of main effects and
 * two-factor interactions: every main effect, then (in the order AB, AC, ..., BC, ...) each two-factor
 * interaction none of whose aliases of order <= 2 is a main effect or an interaction already taken.
 * Each one is estimated together with its aliases (Box, Hunter & Hunter 2005, ch. 6); it is the same
 * set a least-squares fit keeps when it sets aside, in this order, every column aliased with the
 * columns before it (linear-model.ts). Effects aliased only with interactions of order >= 3 count as
 * clear (those interactions are assumed negligible).
 * @example clearEffects(fractionalFactorial({factors: four, generators: ['D=ABC'], seed: 1}).aliases).length // 7: A, B, C, D, AB, AC, AD
 */
export function clearEffects(aliases: FractionalDesign['aliases']): FractionalDesign['aliases'] {
  const taken = new Set<string>();
  const out: FractionalDesign['aliases'] = [];
  for (const a of aliases) {
    const partners = a.aliases.map((x) => x.replace(/^-/, ''));
    if (a.effect.length === 2 && partners.some((x) => x.length === 1 || taken.has(x))) continue;
    taken.add(a.effect);
    out.push(a);
  }
  return out;
}

function aliasStructure(words: Word[], k: number): { effect: string; aliases: string[] }[] {
  const effects: number[] = [];
  for (let i = 0; i < k; i++) effects.push(1 << i);
  for (let i = 0; i < k; i++) for (let j = i + 1; j < k; j++) effects.push((1 << i) | (1 << j));
  return effects.map((e) => ({
    effect: wordName(e),
    aliases: words.filter((w) => popcount(e ^ w.mask) <= 2).map((w) => `${w.sign < 0 ? '-' : ''}${wordName(e ^ w.mask)}`),
  }));
}

function buildRuns(opts: FractionalOptions, base: number[], parsed: { letter: number; word: Word }[]): DesignRun[] {
  const replicates = opts.replicates ?? 1;
  checkReplicates(replicates);
  const blockOf = blockOfReplicate(replicates, opts.blocks);
  const centre = opts.centrePoints ?? 0;
  if (!Number.isInteger(centre) || centre < 0) throw new StatsInputError(`centre points must be an integer >= 0, got ${centre}`, centre);
  if (centre > 0) {
    const cat = opts.factors.find((f) => typeof f.levels[0] !== 'number' || typeof f.levels[1] !== 'number');
    if (cat) throw new StatsInputError(`centre points need numeric levels; factor "${cat.name}" is categorical`, cat.name);
  }
  const n = 1 << base.length;
  const runs: Omit<DesignRun, 'runOrder'>[] = [];
  let std = 0;
  const blockNames = [...new Set(Array.from({ length: replicates }, (_, r) => blockOf(r + 1)))];
  for (let r = 1; r <= replicates; r++) {
    for (let c = 0; c < n; c++) {
      // Yates order on the base factors: base factor j is +1 when bit j of c is set
      const x = new Array<number>(opts.factors.length).fill(0);
      base.forEach((f, j) => (x[f] = c & (1 << j) ? 1 : -1));
      for (const g of parsed) {
        let v: number = g.word.sign;
        for (const f of base) if (g.word.mask & (1 << f)) v *= x[f];
        x[g.letter] = v;
      }
      const levels: Record<string, Level> = {};
      opts.factors.forEach((f, i) => (levels[f.name] = f.levels[x[i] > 0 ? 1 : 0]));
      runs.push({ standardOrder: ++std, replicate: r, block: blockOf(r), levels });
    }
  }
  // centre points: per block when blocked (so each block can show curvature), else in total
  for (const b of blockNames) {
    for (let c = 0; c < centre; c++) {
      const levels: Record<string, Level> = {};
      for (const f of opts.factors) levels[f.name] = ((f.levels[0] as number) + (f.levels[1] as number)) / 2;
      const rep = runs.find((r) => r.block === b)?.replicate ?? 1;
      runs.push({ standardOrder: ++std, replicate: rep, block: b, centre: true, levels });
    }
  }
  return assignRunOrder(runs, opts.seed, opts.randomise ?? true);
}
