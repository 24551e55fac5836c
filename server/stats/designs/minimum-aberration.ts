/**
 * Exhaustive search for a minimum-aberration 2^(k-p) design (Fries & Hunter 1980): among all sets
 * of p generator words on the k - p base factors, the one whose word-length pattern
 * (A1, A2, A3, ...) is lexicographically smallest. Used to verify the standard generator table.
 * The cost is C(2^(k-p) - 1 - (k-p), p) pattern evaluations: instant for small designs, minutes
 * for 2^(11-4) (8.2 million sets), e.g.
 *   npx tsx -e "import('./server/stats/designs/minimum-aberration.ts').then(m => console.log(m.minimumAberration(11, 4)))"
 */
import { StatsInputError } from '../errors.js';
import { definingWords, LETTERS, wordLengths, wordName } from './fractional-factorial.js';

function compare(a: number[], b: number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i] - b[i];
  return 0;
}

/** Number of generator sets the search for 2^(k-p) has to evaluate. */
export function searchSize(k: number, p: number): number {
  const n = 2 ** (k - p) - 1 - (k - p);
  let c = 1;
  for (let i = 0; i < p; i++) c = (c * (n - i)) / (i + 1);
  return Math.round(c);
}

/**
 * @returns the minimum word-length pattern and one generator set attaining it (first found)
 * @throws StatsInputError for k > 11 or p outside 1..k-2
 */
export function minimumAberration(k: number, p: number): { pattern: number[]; generators: string[] } {
  if (!Number.isInteger(k) || k < 3 || k > LETTERS.length) throw new StatsInputError(`k must be 3..11, got ${k}`, k);
  if (!Number.isInteger(p) || p < 1 || p > k - 2) throw new StatsInputError(`p must be 1..${k - 2}, got ${p}`, p);
  const base = k - p;
  const candidates: number[] = [];
  for (let m = 1; m < 1 << base; m++) if ((m & (m - 1)) !== 0) candidates.push(m);
  let best: number[] | null = null;
  let bestSet: number[] = [];
  const chosen: number[] = [];
  const visit = (start: number): void => {
    if (chosen.length === p) {
      const words = chosen.map((m, i) => ({ mask: m | (1 << (base + i)), sign: 1 as const }));
      const wlp = wordLengths(definingWords(words), k).wordLengthPattern;
      if (best === null || compare(wlp, best) < 0) {
        best = wlp;
        bestSet = [...chosen];
      }
      return;
    }
    for (let i = start; i < candidates.length; i++) {
      chosen.push(candidates[i]);
      visit(i + 1);
      chosen.pop();
    }
  };
  visit(0);
  return { pattern: best ?? [], generators: bestSet.map((m, i) => `${LETTERS[base + i]}=${wordName(m)}`) };
}
