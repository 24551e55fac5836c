/**
 * Dispersion analysis: which factor drives the scatter of the response, and which setting gives
 * a response on target with the least scatter.
 *
 * Per cell (one combination of factor levels): n, mean, SD, ln s², CV and the Taguchi
 * signal-to-noise ratios (Taguchi; see Phadke 1989, ch. 6; Wu & Hamada 2009, ch. 10):
 *   nominal-the-best  10 log10(ȳ² / s²)
 *   smaller-the-better  -10 log10(mean y²)
 *   larger-the-better   -10 log10(mean 1/y²)
 * Per factor level: the mean of ln s² and of CV over the cells at that level. Per factor: Levene
 * and Brown–Forsythe tests on the within-cell deviations |y - cell centre| grouped by the factor's
 * levels (centring within cells keeps the other factors' location effects out of the spread).
 * ln s² is the classic response for dispersion effects (Bartlett & Kendall 1946; Box & Meyer 1986):
 * the per-cell table is returned so the caller can fit ln s² with the linear model of its choice;
 * when every combination is present exactly once, a balanced main-effects ANOVA of ln s² is done
 * here too (its residual is the pooled interactions, so it needs at least one df left over).
 *
 * Ranking rule (documented for users): cells with n >= 2 are ordered by an estimated loss,
 * smaller first — nominal: (ȳ - T)² + s² (Taguchi's quadratic loss per unit, on target and low
 * scatter at once); smaller-the-better: mean y²; larger-the-better: mean 1/y²; scatter only: s².
 * Cells with n < 2 have no scatter estimate and are listed unranked.
 *
 * Caution: s² from a handful of runs is itself very noisy (ln s² has variance ≈ 2/(n - 1));
 * treat a ranking as a shortlist for confirmation runs, not as a decision.
 */
import { fUpperTail } from './distributions.js';
import { StatsInputError } from './errors.js';
import { median, oneWayF, type FTest } from './levene.js';

export type DispersionGoal = { kind: 'nominal'; target: number } | { kind: 'smaller' } | { kind: 'larger' } | { kind: 'scatter' };

/** Input: one cell per combination of factor levels. */
export interface DispersionCellInput {
  key: Record<string, string>;
  values: number[];
}

export interface CellDispersion {
  key: Record<string, string>;
  n: number;
  mean: number;
  /** sample SD (null for n < 2) */
  sd: number | null;
  /** ln s² (null when n < 2 or s = 0) */
  lnVariance: number | null;
  /** s / |ȳ| (null when n < 2 or ȳ = 0) */
  cv: number | null;
  signalToNoise: { nominal: number | null; smaller: number; larger: number | null };
}

export interface LevelDispersion {
  factor: string;
  level: string;
  cells: number;
  meanLnVariance: number | null;
  meanCv: number | null;
}

export interface AnovaRow {
  source: string;
  df: number;
  ss: number;
  ms: number;
  f: number | null;
  p: number | null;
}

export interface DispersionResult {
  cells: CellDispersion[];
  levels: LevelDispersion[];
  varianceTests: { factor: string; levene: FTest | null; brownForsythe: FTest | null; note?: string }[];
  lnVarianceAnova: AnovaRow[] | null;
  ranking: { rank: number | null; key: Record<string, string>; loss: number | null }[];
  rankingRule: string;
  notes: string[];
}

const mean = (x: number[]): number => x.reduce((a, b) => a + b, 0) / x.length;

function describeCell(cell: DispersionCellInput): CellDispersion {
  const n = cell.values.length;
  const m = mean(cell.values);
  const variance = n >= 2 ? cell.values.reduce((s, v) => s + (v - m) ** 2, 0) / (n - 1) : null;
  const sd = variance === null ? null : Math.sqrt(variance);
  const meanSq = mean(cell.values.map((v) => v * v));
  const hasZero = cell.values.some((v) => v === 0);
  return {
    key: cell.key,
    n,
    mean: m,
    sd,
    lnVariance: variance !== null && variance > 0 ? Math.log(variance) : null,
    cv: sd !== null && m !== 0 ? sd / Math.abs(m) : null,
    signalToNoise: {
      nominal: variance !== null && variance > 0 ? 10 * Math.log10((m * m) / variance) : null,
      smaller: -10 * Math.log10(meanSq),
      larger: hasZero ? null : -10 * Math.log10(mean(cell.values.map((v) => 1 / (v * v)))),
    },
  };
}

function validate(cells: DispersionCellInput[], factors: string[], goal: DispersionGoal): void {
  if (factors.length === 0) throw new StatsInputError('dispersion analysis needs at least one factor', factors);
  if (new Set(factors).size !== factors.length) throw new StatsInputError(`a factor is named twice in ${factors.join(', ')}`, factors);
  if (cells.length < 2) throw new StatsInputError(`dispersion analysis needs at least two cells, got ${cells.length}`, cells.length);
  const seen = new Set<string>();
  for (const c of cells) {
    for (const f of factors) {
      if (typeof c.key[f] !== 'string') throw new StatsInputError(`cell ${JSON.stringify(c.key)} has no level for factor "${f}"`, f);
    }
    const id = factors.map((f) => c.key[f]).join('\u0000');
    if (seen.has(id)) throw new StatsInputError(`cell ${JSON.stringify(c.key)} appears twice`, c.key);
    seen.add(id);
    if (c.values.length === 0) throw new StatsInputError(`cell ${JSON.stringify(c.key)} has no values`, c.key);
    for (const v of c.values) if (!Number.isFinite(v)) throw new StatsInputError(`cell ${JSON.stringify(c.key)} contains ${v}`, v);
  }
  if (goal.kind === 'nominal' && !Number.isFinite(goal.target)) throw new StatsInputError(`target must be a finite number, got ${goal.target}`, goal.target);
  if (!['nominal', 'smaller', 'larger', 'scatter'].includes(goal.kind)) throw new StatsInputError(`unknown goal "${String(goal.kind)}"`, goal);
}

function loss(cell: CellDispersion, values: number[], goal: DispersionGoal): number | null {
  if (cell.sd === null) return null;
  switch (goal.kind) {
    case 'nominal':
      return (cell.mean - goal.target) ** 2 + cell.sd ** 2;
    case 'smaller':
      return mean(values.map((v) => v * v));
    case 'larger':
      return values.some((v) => v === 0) ? null : mean(values.map((v) => 1 / (v * v)));
    case 'scatter':
      return cell.sd ** 2;
  }
}

/**
 * Balanced main-effects ANOVA of one value per cell over a complete factorial (each combination
 * exactly once): SS_A = (C / L_A) Σ_levels (mean at level - grand mean)², residual = the rest.
 * Returns null when the cells are not a complete factorial or no residual df remain.
 */
export function balancedMainEffects(rows: { key: Record<string, string>; value: number }[], factors: string[]): AnovaRow[] | null {
  const levels = factors.map((f) => [...new Set(rows.map((r) => r.key[f]))]);
  const combos = levels.reduce((p, l) => p * l.length, 1);
  if (rows.length % combos !== 0) return null;
  const reps = rows.length / combos;
  const count = new Map<string, number>();
  for (const r of rows) {
    const id = factors.map((f) => r.key[f]).join('\u0000');
    count.set(id, (count.get(id) ?? 0) + 1);
  }
  if (count.size !== combos || [...count.values()].some((c) => c !== reps)) return null;
  const grand = mean(rows.map((r) => r.value));
  const total = rows.reduce((s, r) => s + (r.value - grand) ** 2, 0);
  const out: AnovaRow[] = factors.map((f, i) => {
    const ss = levels[i].reduce((s, lv) => {
      const at = rows.filter((r) => r.key[f] === lv).map((r) => r.value);
      return s + at.length * (mean(at) - grand) ** 2;
    }, 0);
    const df = levels[i].length - 1;
    return { source: f, df, ss, ms: ss / df, f: null, p: null };
  });
  const dfRes = rows.length - 1 - out.reduce((s, r) => s + r.df, 0);
  if (dfRes < 1) return null;
  const ssRes = Math.max(0, total - out.reduce((s, r) => s + r.ss, 0));
  const msRes = ssRes / dfRes;
  for (const r of out) {
    if (msRes > 0) {
      r.f = r.ms / msRes;
      r.p = fUpperTail(r.f, r.df, dfRes);
    }
  }
  return [...out, { source: 'Residual', df: dfRes, ss: ssRes, ms: msRes, f: null, p: null }];
}

/**
 * Levene (centre 'mean') / Brown–Forsythe (centre 'median') for one factor: one-way ANOVA of
 * z = |y - centre of y's own cell| grouped by the factor's levels. With one factor (cells = levels)
 * this is exactly the textbook test.
 */
function varianceTest(cells: DispersionCellInput[], factor: string, center: 'mean' | 'median'): FTest | null {
  const byLevel = new Map<string, number[]>();
  for (const c of cells) {
    const centre = center === 'mean' ? mean(c.values) : median(c.values);
    const z = c.values.map((v) => Math.abs(v - centre));
    byLevel.set(c.key[factor], [...(byLevel.get(c.key[factor]) ?? []), ...z]);
  }
  const groups = [...byLevel.values()];
  if (groups.length < 2) return null;
  return oneWayF(groups, center === 'mean' ? 'Levene test' : 'Brown-Forsythe test');
}

/**
 * Dispersion analysis of a factorial study.
 * @param cells one entry per cell: its factor levels (`key`) and response values
 * @param factors the factor names to analyse (each must appear in every key)
 * @param goal nominal-the-best with a target, smaller-the-better, larger-the-better, or scatter only
 * @returns per-cell and per-level dispersion, variance tests per factor, ln s² main effects, ranking
 * @throws StatsInputError for missing levels, duplicate cells, empty cells, non-finite values, repeated factors
 * @example dispersionAnalysis(cells, ['width', 'radius'], {kind: 'nominal', target: 1.2})
 */
export function dispersionAnalysis(cells: DispersionCellInput[], factors: string[], goal: DispersionGoal): DispersionResult {
  validate(cells, factors, goal);
  const described = cells.map(describeCell);
  const notes: string[] = [];
  const levels: LevelDispersion[] = factors.flatMap((f) =>
    [...new Set(cells.map((c) => c.key[f]))].map((level) => {
      const at = described.filter((d) => d.key[f] === level);
      const ln = at.map((d) => d.lnVariance).filter((v): v is number => v !== null);
      const cv = at.map((d) => d.cv).filter((v): v is number => v !== null);
      return { factor: f, level, cells: at.length, meanLnVariance: ln.length ? mean(ln) : null, meanCv: cv.length ? mean(cv) : null };
    }),
  );
  const varianceTests = factors.map((factor) => {
    try {
      return { factor, levene: varianceTest(cells, factor, 'mean'), brownForsythe: varianceTest(cells, factor, 'median') };
    } catch (err) {
      // Expected: no spread at all, or too few values, makes the test undefined; say why.
      if (err instanceof StatsInputError) return { factor, levene: null, brownForsythe: null, note: err.message };
      throw err;
    }
  });
  const lnRows = described.filter((d) => d.lnVariance !== null).map((d) => ({ key: d.key, value: d.lnVariance as number }));
  const lnVarianceAnova = lnRows.length === cells.length ? balancedMainEffects(lnRows, factors) : null;
  if (lnVarianceAnova === null) {
    notes.push('ln s² main effects not computed here (cells incomplete, unbalanced, without spread, or no residual df): fit the per-cell ln s² with the linear model instead.');
  }
  const losses = described.map((d, i) => ({ key: d.key, loss: loss(d, cells[i].values, goal) }));
  const ranked = losses.filter((l) => l.loss !== null).sort((a, b) => (a.loss as number) - (b.loss as number));
  const ranking = [...ranked.map((l, i) => ({ rank: i + 1, ...l })), ...losses.filter((l) => l.loss === null).map((l) => ({ rank: null, ...l }))];
  if (ranking.some((r) => r.rank === null)) notes.push('cells with fewer than two runs (or a zero response for larger-the-better) are not ranked.');
  notes.push('s² from few runs is noisy: confirm a chosen setting with new runs before adopting it.');
  const rankingRule = {
    nominal: 'ascending (mean - target)² + s² (quadratic loss)',
    smaller: 'ascending mean of y² (smaller-the-better loss)',
    larger: 'ascending mean of 1/y² (larger-the-better loss)',
    scatter: 'ascending s² (scatter only)',
  }[goal.kind];
  return { cells: described, levels, varianceTests, lnVarianceAnova, ranking, rankingRule, notes };
}
