import { describe, expect, it } from 'vitest';
import { StatsInputError } from '../errors.js';
import { fullFactorial } from './full-factorial.js';

const factors = [
  { name: 'radius', levels: [0.5, 1, 2] },
  { name: 'notch', levels: ['V', 'U'] },
];

describe('fullFactorial', () => {
  it('lists every combination once per replicate, first factor fastest in standard order', () => {
    // Yates standard order generalised to mixed levels (Box, Hunter & Hunter 2005, ch. 5)
    const runs = fullFactorial({ factors, replicates: 2, seed: 1, randomise: false });
    expect(runs).toHaveLength(12);
    const std = [...runs].sort((a, b) => a.standardOrder - b.standardOrder);
    expect(std.slice(0, 6).map((r) => [r.levels.radius, r.levels.notch])).toEqual([
      [0.5, 'V'], [1, 'V'], [2, 'V'], [0.5, 'U'], [1, 'U'], [2, 'U'],
    ]);
    expect(std.slice(6).map((r) => r.replicate)).toEqual([2, 2, 2, 2, 2, 2]);
    expect(runs.map((r) => r.runOrder)).toEqual([...Array(12).keys()].map((i) => i + 1));
  });

  it('randomises reproducibly: the same seed gives the same order, another seed another order', () => {
    const a = fullFactorial({ factors, replicates: 3, seed: 42 });
    const b = fullFactorial({ factors, replicates: 3, seed: 42 });
    const c = fullFactorial({ factors, replicates: 3, seed: 43 });
    expect(a.map((r) => r.standardOrder)).toEqual(b.map((r) => r.standardOrder));
    expect(a.map((r) => r.standardOrder)).not.toEqual(c.map((r) => r.standardOrder));
    expect([...a.map((r) => r.standardOrder)].sort((x, y) => x - y)).toEqual([...Array(18).keys()].map((i) => i + 1));
  });

  it('keeps each complete block together and randomises within it', () => {
    const runs = fullFactorial({ factors, replicates: 4, blocks: ['day 1', 'day 2'], seed: 5 });
    expect(runs.slice(0, 12).every((r) => r.block === 'day 1')).toBe(true);
    expect(runs.slice(12).every((r) => r.block === 'day 2')).toBe(true);
    // each block holds two complete replicates: every cell twice
    const cellsDay1 = runs.slice(0, 12).map((r) => `${r.levels.radius}/${r.levels.notch}`);
    expect(new Set(cellsDay1).size).toBe(6);
    const perRep = fullFactorial({ factors, replicates: 3, blocks: 'perReplicate', seed: 5 });
    expect(perRep.slice(0, 6).every((r) => r.block === 'Block 1' && r.replicate === 1)).toBe(true);
  });

  it('rejects bad input with StatsInputError naming the value', () => {
    expect(() => fullFactorial({ factors: [], seed: 1 })).toThrow(StatsInputError);
    expect(() => fullFactorial({ factors: [factors[0], { name: 'radius', levels: [1, 2] }], seed: 1 })).toThrow(/"radius" is named twice/);
    expect(() => fullFactorial({ factors: [{ name: 'a', levels: [1] }], seed: 1 })).toThrow(/"a" needs at least 2/);
    expect(() => fullFactorial({ factors: [{ name: 'a', levels: [1, 1] }], seed: 1 })).toThrow(/level "1" twice/);
    expect(() => fullFactorial({ factors, replicates: 0, seed: 1 })).toThrow(/replicates.*0/);
    expect(() => fullFactorial({ factors, replicates: 3, blocks: ['x', 'y'], seed: 1 })).toThrow(/divisible by 2, got 3/);
    expect(() => fullFactorial({ factors, seed: 0.5 })).toThrow(/seed.*0.5/);
  });
});
