/**
 * The optional tests of an analysis: variance checks (Levene, Brown–Forsythe, Bartlett), the
 * alternatives to the F test (Welch, Kruskal–Wallis), Tukey HSD, and Shapiro–Wilk on the residuals.
 *
 * One-factor tests compare the cells of the analysed factors: each observed combination of levels is
 * one group, labelled `A1:B2`, in standard order (first factor varying fastest). They run on the
 * responses after the exact decimal offset was removed; all of them are shift-invariant, and Tukey's
 * differences of means are unaffected by a common shift.
 */
import { bartlett } from './bartlett.js';
import type { CellTable } from './cell-stats.js';
import { formatP } from './distributions.js';
import { StatsInputError } from './errors.js';
import { kruskalWallis } from './kruskal-wallis.js';
import { levene } from './levene.js';
import { shapiroWilk } from './shapiro-wilk.js';
import { tukeyHsd } from './tukey.js';
import type { AnalysisTests, TestName } from './types.js';
import { welchAnova } from './welch.js';

export const TEST_NAMES: readonly TestName[] = ['tukey', 'welch', 'levene', 'brown-forsythe', 'bartlett', 'kruskal', 'shapiro'];

/** Groups of responses per observed cell, labelled and in standard order. */
export function cellGroups(
  table: CellTable,
  y: ArrayLike<number>,
): { label: string; levels: Record<string, string>; values: number[] }[] {
  const sizes = table.factors.map((f) => f.levels.length);
  const order = Array.from({ length: table.cellCount }, (_, c) => c);
  const standardIndex = (c: number): number => {
    let idx = 0;
    let stride = 1;
    table.factors.forEach((_, f) => {
      idx += table.cellLevels[f][c] * stride;
      stride *= sizes[f];
    });
    return idx;
  };
  order.sort((p, q) => standardIndex(p) - standardIndex(q));
  const groupOfCell = new Int32Array(table.cellCount);
  order.forEach((c, g) => (groupOfCell[c] = g));
  const groups = order.map((c) => ({
    label: table.factors.map((f, fi) => f.levels[table.cellLevels[fi][c]]).join(':'),
    levels: Object.fromEntries(table.factors.map((f, fi) => [f.name, f.levels[table.cellLevels[fi][c]]])),
    values: [] as number[],
  }));
  for (let i = 0; i < table.n; i++) groups[groupOfCell[table.cellOfRun[i]]].values.push(y[i]);
  return groups;
}

/**
 * Run the requested tests. A test the data cannot support (e.g. Shapiro–Wilk beyond 5000 runs, a
 * variance test with one run in a cell) is skipped with a note instead of failing the analysis.
 * @param tests names from TEST_NAMES
 * @param table cell summaries of the analysed factors (no factors: only shapiro is possible)
 * @param y responses (offset removed), in row order
 * @param residuals model residuals in row order
 * @param alpha significance level: Tukey's confidence level is 1 - alpha, and notes flag p < alpha
 * @throws StatsInputError for an unknown test name, or a one-factor test without any factor
 */
export function runTests(
  tests: ReadonlyArray<string>,
  table: CellTable,
  y: ArrayLike<number>,
  residuals: ArrayLike<number>,
  alpha: number,
): { tests: AnalysisTests; notes: string[] } {
  const out: AnalysisTests = {};
  const notes: string[] = [];
  const unknown = tests.find((t) => !TEST_NAMES.includes(t as TestName));
  if (unknown !== undefined) throw new StatsInputError(`unknown test '${unknown}' (known: ${TEST_NAMES.join(', ')})`, unknown);
  const needsGroups = tests.filter((t) => t !== 'shapiro');
  if (needsGroups.length > 0 && table.factors.length === 0) {
    throw new StatsInputError(`test '${needsGroups[0]}' compares groups and needs at least one factor`, needsGroups[0]);
  }
  const groups = table.factors.length > 0 ? cellGroups(table, y) : [];
  const values = groups.map((g) => g.values);
  const run = (name: string, fn: () => void): void => {
    try {
      fn();
    } catch (err) {
      // Expected failure: the test's own input checks (StatsInputError), e.g. too few runs per cell.
      if (!(err instanceof StatsInputError)) throw err;
      notes.push(`${name} not run: ${err.message}`);
    }
  };
  const flag = (name: string, p: number, meaning: string): void => {
    if (p < alpha) notes.push(`${name}: ${formatP(p)} < ${alpha}: ${meaning}`);
  };
  const varianceHint = 'the group variances look unequal; consider Welch\'s ANOVA or Kruskal–Wallis and the dispersion analysis';
  for (const t of TEST_NAMES.filter((name) => tests.includes(name))) {
    if (t === 'tukey') run(t, () => (out.tukey = tukeyHsd(groups.map(({ label, values: v }) => ({ label, values: v })), { confLevel: 1 - alpha })));
    if (t === 'welch') run(t, () => (out.welch = welchAnova(values)));
    if (t === 'levene') run(t, () => {
      out.levene = levene(values, 'mean');
      flag('Levene', out.levene.p, varianceHint);
    });
    if (t === 'brown-forsythe') run(t, () => {
      out.brownForsythe = levene(values, 'median');
      flag('Brown–Forsythe', out.brownForsythe.p, varianceHint);
    });
    if (t === 'bartlett') run(t, () => {
      out.bartlett = bartlett(values);
      flag('Bartlett', out.bartlett.p, `${varianceHint} (Bartlett is also sensitive to non-normality)`);
    });
    if (t === 'kruskal') run(t, () => (out.kruskal = kruskalWallis(values)));
    if (t === 'shapiro') run(t, () => {
      const r = shapiroWilk(Array.from(residuals));
      out.shapiro = { w: r.w, p: r.p };
      flag('Shapiro–Wilk', r.p, 'the residuals do not look normal; consider Kruskal–Wallis or a transformation');
    });
  }
  return { tests: out, notes };
}
