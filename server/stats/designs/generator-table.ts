/**
 * Standard generators of two-level fractional factorials 2^(k-p), k <= 11, as tabulated in
 * Box, Hunter & Hunter (2005, Table 6.22) and Montgomery (Design and Analysis of Experiments,
 * table "selected 2^(k-p) fractional factorial designs"), which list minimum-aberration or
 * maximum-resolution choices. FROM MEMORY: the generator sets below were recalled, not copied;
 * fractional-factorial.spec.ts recomputes each one's resolution and word-length pattern and checks
 * the resolution against the published value stored beside it, and checks by exhaustive search
 * that no other generator set has a better word-length pattern (minimum aberration): in the test
 * for the 20 small cases, and offline (minutes of search; minima recorded in the spec) for the
 * other 7. All 27 entries are minimum aberration by that search.
 * Letters follow the usual convention A..L without I (I is the identity in defining relations).
 */
export interface GeneratorEntry {
  k: number;
  p: number;
  generators: string[];
  /** resolution as published (from memory), checked by computation in the spec */
  resolution: number;
}

export const STANDARD_GENERATORS: GeneratorEntry[] = [
  { k: 3, p: 1, generators: ['C=AB'], resolution: 3 },
  { k: 4, p: 1, generators: ['D=ABC'], resolution: 4 },
  { k: 5, p: 1, generators: ['E=ABCD'], resolution: 5 },
  { k: 5, p: 2, generators: ['D=AB', 'E=AC'], resolution: 3 },
  { k: 6, p: 1, generators: ['F=ABCDE'], resolution: 6 },
  { k: 6, p: 2, generators: ['E=ABC', 'F=BCD'], resolution: 4 },
  { k: 6, p: 3, generators: ['D=AB', 'E=AC', 'F=BC'], resolution: 3 },
  { k: 7, p: 1, generators: ['G=ABCDEF'], resolution: 7 },
  { k: 7, p: 2, generators: ['F=ABCD', 'G=ABDE'], resolution: 4 },
  { k: 7, p: 3, generators: ['E=ABC', 'F=BCD', 'G=ACD'], resolution: 4 },
  { k: 7, p: 4, generators: ['D=AB', 'E=AC', 'F=BC', 'G=ABC'], resolution: 3 },
  { k: 8, p: 1, generators: ['H=ABCDEFG'], resolution: 8 },
  { k: 8, p: 2, generators: ['G=ABCD', 'H=ABEF'], resolution: 5 },
  { k: 8, p: 3, generators: ['F=ABC', 'G=ABD', 'H=BCDE'], resolution: 4 },
  { k: 8, p: 4, generators: ['E=BCD', 'F=ACD', 'G=ABC', 'H=ABD'], resolution: 4 },
  { k: 9, p: 2, generators: ['H=ACDFG', 'J=BCEFG'], resolution: 6 },
  { k: 9, p: 3, generators: ['G=ABCD', 'H=ACEF', 'J=CDEF'], resolution: 4 },
  { k: 9, p: 4, generators: ['F=BCDE', 'G=ACDE', 'H=ABDE', 'J=ABCE'], resolution: 4 },
  { k: 9, p: 5, generators: ['E=ABC', 'F=BCD', 'G=ACD', 'H=ABD', 'J=ABCD'], resolution: 3 },
  // The recalled set (H=ABCG, J=ACFG, K=BCEG) computed to resolution IV, so it was misremembered;
  // replaced by the minimum-aberration set found by exhaustive search (WLP A5 = 3, A6 = 3, A7 = 1).
  { k: 10, p: 3, generators: ['H=ABCD', 'J=ABEF', 'K=ACEG'], resolution: 5 },
  { k: 10, p: 4, generators: ['G=BCDF', 'H=ACDF', 'J=ABDE', 'K=ABCE'], resolution: 4 },
  { k: 10, p: 5, generators: ['F=ABCD', 'G=ABCE', 'H=ABDE', 'J=ACDE', 'K=BCDE'], resolution: 4 },
  { k: 10, p: 6, generators: ['E=ABC', 'F=BCD', 'G=ACD', 'H=ABD', 'J=ABCD', 'K=AB'], resolution: 3 },
  { k: 11, p: 4, generators: ['H=ABCG', 'J=BCDE', 'K=ACDF', 'L=ABCDEFG'], resolution: 5 },
  { k: 11, p: 5, generators: ['G=CDE', 'H=ABCD', 'J=ABF', 'K=BDEF', 'L=ADEF'], resolution: 4 },
  { k: 11, p: 6, generators: ['F=ABC', 'G=BCD', 'H=CDE', 'J=ACD', 'K=ADE', 'L=BDE'], resolution: 4 },
  { k: 11, p: 7, generators: ['E=ABC', 'F=BCD', 'G=ACD', 'H=ABD', 'J=ABCD', 'K=AB', 'L=AC'], resolution: 3 },
];
