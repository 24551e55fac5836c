import { describe, expect, it } from 'vitest';
import { StatsInputError } from '../errors.js';
import { clearEffects, definingWords, fractionalFactorial, LETTERS, parseGenerator, wordLengths, type TwoLevelFactor } from './fractional-factorial.js';
import { fullFactorial } from './full-factorial.js';
import { STANDARD_GENERATORS } from './generator-table.js';
import { minimumAberration, searchSize } from './minimum-aberration.js';

const numeric = (k: number): TwoLevelFactor[] =>
  Array.from({ length: k }, (_, i) => ({ name: `x${i + 1}`, levels: [10 * i, 10 * i + 4] as [number, number] }));

/** Word-length pattern (A3, A4, ...) of a generator set, from the design algebra. */
function pattern(generators: string[], k: number): number[] {
  const words = definingWords(generators.map((g) => parseGenerator(g, k).word));
  return wordLengths(words, k).wordLengthPattern;
}

describe('standard generator table (recalled from Box, Hunter & Hunter / Montgomery: from memory)', () => {
  it.each(STANDARD_GENERATORS)('2^($k-$p): computed resolution equals the published $resolution', (e) => {
    const d = fractionalFactorial({ factors: numeric(e.k), fraction: e.p, seed: 1 });
    expect(d.resolution).toBe(e.resolution);
    expect(d.runs).toHaveLength(2 ** (e.k - e.p));
  });

  it('is minimum aberration wherever an exhaustive search is small (<= 20 000 generator sets)', () => {
    // Fries & Hunter (1980) definition: minimise A3, then A4, ...; the search is the definition itself
    let searched = 0;
    for (const e of STANDARD_GENERATORS) {
      if (searchSize(e.k, e.p) > 20_000) continue;
      searched++;
      expect(pattern(e.generators, e.k), `2^(${e.k}-${e.p})`).toEqual(minimumAberration(e.k, e.p).pattern);
    }
    expect(searched).toBe(20);
  });

  it('search finds known minima: 2^(5-1) one word ABCDE; 2^(7-4) seven 3-, seven 4-, one 7-letter word', () => {
    // 2^(7-4) saturated design: its 15 defining words are 7 of length 3, 7 of length 4 and ABCDEFG
    // (BHH 2005, ch. 6); 2^(5-1): I = ABCDE
    expect(minimumAberration(5, 1).pattern).toEqual([0, 0, 0, 0, 1]);
    const sat = minimumAberration(7, 4);
    expect(sat.pattern).toEqual([0, 0, 7, 7, 0, 0, 1]);
    expect(pattern(sat.generators, 7)).toEqual(sat.pattern);
    expect(() => minimumAberration(12, 4)).toThrow(/got 12/);
  });

  it('matches the minimum word-length patterns of the larger searches (run offline)', () => {
    // minimumAberration(k, p) takes seconds to minutes for these sizes (searchSize 29 260 to 8.2
    // million), so it was run once outside the test suite (command in minimum-aberration.ts); its
    // minima (A1..Ak) are recorded here so that an edit of the table cannot lose minimum aberration.
    const offline: Record<string, number[]> = {
      '9-3': [0, 0, 0, 1, 4, 2, 0, 0, 0],
      '10-3': [0, 0, 0, 0, 3, 3, 1, 0, 0, 0],
      '10-4': [0, 0, 0, 2, 8, 4, 0, 1, 0, 0],
      '10-5': [0, 0, 0, 10, 16, 0, 0, 5, 0, 0],
      '11-4': [0, 0, 0, 0, 6, 6, 2, 1, 0, 0, 0],
      '11-5': [0, 0, 0, 4, 14, 8, 0, 3, 2, 0, 0],
      '11-6': [0, 0, 0, 25, 0, 27, 0, 10, 0, 1, 0],
    };
    for (const [kp, want] of Object.entries(offline)) {
      const [k, p] = kp.split('-').map(Number);
      const e = STANDARD_GENERATORS.find((x) => x.k === k && x.p === p);
      expect(pattern(e?.generators ?? [], k), kp).toEqual(want);
    }
  });
});

describe('fractionalFactorial', () => {
  it('builds the 2^(5-1) half fraction E = ABCD with its defining relation and aliases', () => {
    // BHH 2005 ch. 6: I = ABCDE, resolution V; main effects alias four-factor interactions and
    // two-factor interactions alias three-factor ones, so no alias of order <= 2 appears
    const d = fractionalFactorial({ factors: numeric(5), generators: ['E=ABCD'], seed: 3 });
    expect(d.definingRelation).toBe('I = ABCDE');
    expect(d.resolution).toBe(5);
    expect(d.wordLengthPattern).toEqual([0, 0, 0, 0, 1]);
    expect(d.aliases.every((a) => a.aliases.length === 0)).toBe(true);
    // every run satisfies E = A·B·C·D in coded units
    for (const r of d.runs) {
      const x = d.letters.map(({ factor }, i) => ((r.levels[factor] as number) === 10 * i + 4 ? 1 : -1));
      expect(x[4]).toBe(x[0] * x[1] * x[2] * x[3]);
    }
  });

  it('gives the resolution III aliases of the 2^(7-4) design', () => {
    // D = AB, E = AC, F = BC, G = ABC: A is aliased with BD, CE and FG (BHH 2005, ch. 6 saturated design)
    const d = fractionalFactorial({ factors: numeric(7), generators: ['D=AB', 'E=AC', 'F=BC', 'G=ABC'], seed: 3 });
    expect(d.definingRelation.split(' = ')).toHaveLength(16);
    expect(d.resolution).toBe(3);
    expect([...(d.aliases.find((a) => a.effect === 'A')?.aliases ?? [])].sort()).toEqual(['BD', 'CE', 'FG']);
  });

  it('carries the sign of a negative generator into the runs and the defining relation', () => {
    const d = fractionalFactorial({ factors: numeric(4), generators: ['D=-ABC'], seed: 1 });
    expect(d.definingRelation).toBe('I = -ABCD');
    for (const r of d.runs) {
      const x = d.letters.map(({ factor }, i) => ((r.levels[factor] as number) === 10 * i + 4 ? 1 : -1));
      expect(x[3]).toBe(-x[0] * x[1] * x[2]);
    }
  });

  it('adds centre points at the midpoints, per block, and randomises reproducibly', () => {
    const d = fractionalFactorial({ factors: numeric(4), fraction: 1, replicates: 2, blocks: 'perReplicate', centrePoints: 2, seed: 11 });
    expect(d.runs).toHaveLength(2 * 8 + 2 * 2);
    const centres = d.runs.filter((r) => r.centre);
    expect(centres).toHaveLength(4);
    expect(centres.every((r) => r.levels.x1 === 2 && r.levels.x4 === 32)).toBe(true);
    expect(d.runs.slice(0, 10).every((r) => r.block === 'Block 1')).toBe(true);
    const again = fractionalFactorial({ factors: numeric(4), fraction: 1, replicates: 2, blocks: 'perReplicate', centrePoints: 2, seed: 11 });
    expect(again.runs.map((r) => r.standardOrder)).toEqual(d.runs.map((r) => r.standardOrder));
  });

  it('rejects unknown letters, repeated generators, k > 11, categorical centre points', () => {
    expect(() => fractionalFactorial({ factors: numeric(5), generators: ['E=ABCZ'], seed: 1 })).toThrow(/letter "Z"/);
    expect(() => fractionalFactorial({ factors: numeric(6), generators: ['E=ABC', 'E=ABD'], seed: 1 })).toThrow(/defines E a second time/);
    expect(() => fractionalFactorial({ factors: numeric(6), generators: ['E=ABC', 'F=ABC'], seed: 1 })).toThrow(/repeat the same word/);
    expect(() => fractionalFactorial({ factors: numeric(6), generators: ['E=AB', 'F=ABE'], seed: 1 })).toThrow(/generated letter E/);
    expect(() => fractionalFactorial({ factors: numeric(12), fraction: 4, seed: 1 })).toThrow(/at most 11 factors, got 12/);
    expect(() => fractionalFactorial({ factors: numeric(5), generators: ['E=A'], seed: 1 })).toThrow(/main effect/);
    expect(() => fractionalFactorial({ factors: numeric(5), generators: ['E+ABCD'], seed: 1 })).toThrow(/"E\+ABCD"/);
    const cat: TwoLevelFactor[] = [...numeric(3), { name: 'coating', levels: ['none', 'oil'] }];
    expect(() => fractionalFactorial({ factors: cat, generators: ['D=ABC'], centrePoints: 1, seed: 1 })).toThrow(/"coating" is categorical/);
    expect(() => fractionalFactorial({ factors: numeric(5), fraction: 4, seed: 1 })).toThrow(StatsInputError);
    expect(LETTERS).not.toContain('I');
  });
});

describe('fractionalFactorial with p = 0 (the full 2^k)', () => {
  it('gives the full 2^3 in Yates order with nothing aliased', () => {
    // Yates standard order (-,-,-), (+,-,-), (-,+,-), (+,+,-), ... (Box, Hunter & Hunter 2005, ch. 5)
    const d = fractionalFactorial({ factors: numeric(3), generators: [], seed: 1, randomise: false });
    expect(d.runs.map((r) => [r.levels.x1, r.levels.x2, r.levels.x3])).toEqual([
      [0, 10, 20], [4, 10, 20], [0, 14, 20], [4, 14, 20], [0, 10, 24], [4, 10, 24], [0, 14, 24], [4, 14, 24],
    ]);
    expect(d).toMatchObject({ p: 0, definingRelation: 'I', resolution: Infinity, wordLengthPattern: [0, 0, 0] });
    expect(d.aliases.every((a) => a.aliases.length === 0)).toBe(true);
    expect(fractionalFactorial({ factors: numeric(3), fraction: 0, seed: 1 }).runs).toHaveLength(8);
  });

  it('keeps the full-factorial run order for the same seed, so adding centre points only adds runs', () => {
    // same standard order (first factor fastest) and the same seeded shuffle as full-factorial.ts
    const viaFraction = fractionalFactorial({ factors: numeric(3), generators: [], replicates: 2, blocks: 'perReplicate', seed: 9 }).runs;
    const full = fullFactorial({ factors: numeric(3), replicates: 2, blocks: 'perReplicate', seed: 9 });
    expect(viaFraction).toEqual(full);
  });

  it('adds centre points at the midpoints after the factorial runs, per block, randomised within the block', () => {
    // 2^3 x 2 replicates blocked per replicate + 3 centre points per block (Montgomery, Design and
    // Analysis of Experiments, §6.8, from memory): 16 + 2 x 3 = 22 runs
    const d = fractionalFactorial({ factors: numeric(3), generators: [], replicates: 2, blocks: 'perReplicate', centrePoints: 3, seed: 5 });
    expect(d.runs).toHaveLength(22);
    const centres = d.runs.filter((r) => r.centre);
    expect(centres.map((r) => r.levels)).toEqual(Array(6).fill({ x1: 2, x2: 12, x3: 22 }));
    expect(centres.map((r) => r.standardOrder).sort((a, b) => a - b)).toEqual([17, 18, 19, 20, 21, 22]);
    for (const b of ['Block 1', 'Block 2']) expect(centres.filter((r) => r.block === b)).toHaveLength(3);
    // block 1 holds run orders 1..11, block 2 12..22; centre runs are shuffled in, not appended
    expect(d.runs.filter((r) => r.block === 'Block 1').map((r) => r.runOrder)).toEqual([...Array(11).keys()].map((i) => i + 1));
    expect(d.runs.filter((r) => r.block === 'Block 1').slice(-3).every((r) => r.centre)).toBe(false);
    // unrandomised, each block ends with its centre runs (standard order after the factorial runs)
    const fixed = fractionalFactorial({ factors: numeric(3), generators: [], replicates: 2, blocks: 'perReplicate', centrePoints: 3, seed: 5, randomise: false });
    expect(fixed.runs.map((r) => (r.centre ? 'c' : 'f')).join('')).toBe('ffffffffcccffffffffccc');
    // without blocks: centre points in total
    expect(fractionalFactorial({ factors: numeric(3), generators: [], replicates: 2, centrePoints: 3, seed: 5 }).runs.filter((r) => r.centre)).toHaveLength(3);
  });

  it('takes one or two factors for p = 0 but not for a fraction', () => {
    expect(fractionalFactorial({ factors: numeric(1), generators: [], centrePoints: 2, seed: 1 }).runs).toHaveLength(4);
    expect(fractionalFactorial({ factors: numeric(2), fraction: 0, seed: 1 }).runs).toHaveLength(4);
    expect(() => fractionalFactorial({ factors: numeric(2), generators: ['C=AB'], seed: 1 })).toThrow(/at least 3 factors, got 2/);
    expect(() => fractionalFactorial({ factors: numeric(4), fraction: -1, seed: 1 })).toThrow(/p >= 0/);
  });
});

describe('clearEffects', () => {
  const clear = (k: number, generators: string[]) => clearEffects(fractionalFactorial({ factors: numeric(k), generators, seed: 1 }).aliases);

  it('keeps the interactions of a resolution IV half fraction once per alias chain', () => {
    // 2^(4-1), I = ABCD: AB = CD, AC = BD, AD = BC (Box, Hunter & Hunter 2005, ch. 6)
    expect(clear(4, ['D=ABC']).map((e) => [e.effect, e.aliases])).toEqual([
      ['A', []], ['B', []], ['C', []], ['D', []], ['AB', ['CD']], ['AC', ['BD']], ['AD', ['BC']],
    ]);
  });

  it('drops interactions aliased with main effects and keeps the clear ones of a resolution III design', () => {
    // 2^(5-2), D = AB, E = AC: A = BD = CE, B = AD, C = AE, D = AB, E = AC, BC = DE, BE = CD
    // (Montgomery, Design and Analysis of Experiments, the 2^(5-2) example, from memory)
    const e = clear(5, ['D=AB', 'E=AC']);
    expect(e.map((x) => x.effect)).toEqual(['A', 'B', 'C', 'D', 'E', 'BC', 'BE']);
    expect([...(e[0].aliases)].sort()).toEqual(['BD', 'CE']);
    expect(e.find((x) => x.effect === 'BC')?.aliases).toEqual(['DE']);
    expect(e.find((x) => x.effect === 'BE')?.aliases).toEqual(['CD']);
    // 2^(3-1), C = AB: A = BC, B = AC, C = AB, so main effects only (BHH 2005, ch. 6)
    expect(clear(3, ['C=AB']).map((x) => x.effect)).toEqual(['A', 'B', 'C']);
  });

  it('keeps every interaction when no two-factor alias exists', () => {
    // resolution V (2^(5-1), I = ABCDE) and the full 2^3: 5 + 10 and 3 + 3 effects (arithmetic)
    expect(clear(5, ['E=ABCD'])).toHaveLength(15);
    expect(clear(3, []).map((x) => x.effect)).toEqual(['A', 'B', 'C', 'AB', 'AC', 'BC']);
  });
});
