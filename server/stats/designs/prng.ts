/**
 * Seeded pseudo-random numbers for run-order randomisation.
 *
 * Algorithm: mulberry32 (Tommy Ettinger, 2017, public domain): a 32-bit Weyl sequence
 * (state += 0x6D2B79F5) passed through an xorshift-multiply output mix. It is tiny, fast, has a
 * period of 2^32 and passes the usual statistical batteries for this use; it is NOT
 * cryptographic, which a run order does not need. What matters here is that the seed is recorded
 * in the plan and the same seed always yields the same run order, on every platform: the
 * algorithm uses only 32-bit integer arithmetic (Math.imul, >>>), so it is exactly reproducible.
 *
 * Shuffling: Fisher–Yates (Durstenfeld 1964, Knuth TAOCP vol. 2 Algorithm P), drawing an index
 * j in 0..i by floor(u * (i + 1)); with u a multiple of 2^-32 the bias is below 2^-32 * n.
 */
import { StatsInputError } from '../errors.js';

/**
 * A generator of uniform numbers in [0, 1) from a 32-bit seed.
 * @param seed any integer; it is reduced modulo 2^32
 * @throws StatsInputError for a non-integer seed
 * @example const u = mulberry32(42); u(); u(); // the same two numbers on every run
 */
export function mulberry32(seed: number): () => number {
  if (!Number.isSafeInteger(seed)) throw new StatsInputError(`seed must be an integer, got ${seed}`, seed);
  let state = seed | 0;
  return () => {
    state = (state + 0x6d2b79f5) | 0;
    let t = Math.imul(state ^ (state >>> 15), state | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A copy of `items` in a uniformly random order (Fisher–Yates) driven by `random`. */
export function shuffled<T>(items: readonly T[], random: () => number): T[] {
  const out = [...items];
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** A fresh seed for a new plan (not reproducible by design: the plan stores it). */
export function newSeed(): number {
  return Math.floor(Math.random() * 4294967296);
}
