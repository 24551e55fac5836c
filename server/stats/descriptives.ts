/**
 * Descriptive statistics per factor level and per cell: n, mean, SD, variance, CV, min, max and the
 * 95 % confidence interval of the mean (mean +- t(0.975, n-1) SD / sqrt(n), the group's own SD).
 *
 * Groups are pooled from the cell summaries of cell-stats.ts, exactly: for a union of cells
 *   mean = sum n_c mean_c / n,  SS = sum SS_c + sum n_c (mean_c - mean)^2,
 * so the two-pass accuracy of the cells carries over without another pass over the runs.
 *
 * Caution: a CI from a handful of runs is wide and assumes roughly normal data; the CV is only
 * meaningful for a response on a ratio scale (a true zero).
 */
import { emptyCellLabels, type CellTable } from './cell-stats.js';
import { tUpperQuantile } from './distributions.js';
import type { DescriptivesResult, GroupDescriptives } from './types.js';

/** A union of cells: the runs at one combination of the levels of a subset of the factors. */
export interface PooledGroup {
  /** level index per factor of the subset */
  codes: number[];
  n: number;
  /** mean of d = y - shift (cell-stats units) */
  mean: number;
  ss: number;
  min: number;
  max: number;
}

/**
 * Pool the observed cells over the combinations of `subset` (indices into table.factors), returned in
 * standard order (first factor of the subset varying fastest); combinations without runs are left out.
 */
export function poolCells(table: CellTable, subset: number[]): PooledGroup[] {
  const sizes = subset.map((f) => table.factors[f].levels.length);
  const crossing = sizes.reduce((x, y) => x * y, 1);
  const n = new Float64Array(crossing);
  const sum = new Float64Array(crossing);
  const min = new Float64Array(crossing).fill(Infinity);
  const max = new Float64Array(crossing).fill(-Infinity);
  const groupOf = new Int32Array(table.cellCount);
  for (let c = 0; c < table.cellCount; c++) {
    let idx = 0;
    let stride = 1;
    subset.forEach((f, k) => {
      idx += table.cellLevels[f][c] * stride;
      stride *= sizes[k];
    });
    groupOf[c] = idx;
    n[idx] += table.cellN[c];
    sum[idx] += table.cellN[c] * table.cellMean[c];
    min[idx] = Math.min(min[idx], table.cellMin[c]);
    max[idx] = Math.max(max[idx], table.cellMax[c]);
  }
  const mean = new Float64Array(crossing);
  for (let g = 0; g < crossing; g++) if (n[g] > 0) mean[g] = sum[g] / n[g];
  const ss = new Float64Array(crossing);
  for (let c = 0; c < table.cellCount; c++) {
    const g = groupOf[c];
    ss[g] += table.cellSs[c] + table.cellN[c] * (table.cellMean[c] - mean[g]) ** 2;
  }
  const out: PooledGroup[] = [];
  for (let g = 0; g < crossing; g++) {
    if (n[g] === 0) continue;
    const codes: number[] = [];
    let rest = g;
    for (const s of sizes) {
      codes.push(rest % s);
      rest = Math.floor(rest / s);
    }
    out.push({ codes, n: n[g], mean: mean[g], ss: ss[g], min: min[g], max: max[g] });
  }
  return out;
}

/**
 * Describe one pooled group in the response's own units.
 * @param location added to the cell-stats means/min/max: table.shift plus any decimal offset
 */
export function describePooled(
  group: PooledGroup,
  levels: Record<string, string>,
  location: number,
  confLevel: number,
): GroupDescriptives {
  const mean = location + group.mean;
  const variance = group.n > 1 ? group.ss / (group.n - 1) : null;
  const sd = variance === null ? null : Math.sqrt(variance);
  const half = sd === null ? null : (tUpperQuantile((1 - confLevel) / 2, group.n - 1) * sd) / Math.sqrt(group.n);
  return {
    levels,
    label: Object.values(levels).join(':') || 'all runs',
    n: group.n,
    mean,
    sd,
    variance,
    cv: sd === null || mean === 0 ? null : sd / Math.abs(mean),
    min: location + group.min,
    max: location + group.max,
    ciLower: half === null ? null : mean - half,
    ciUpper: half === null ? null : mean + half,
  };
}

/** Describe the groups of `subset` with their level names. */
export function describeSubset(table: CellTable, subset: number[], location: number, confLevel = 0.95): GroupDescriptives[] {
  return poolCells(table, subset).map((g) => {
    const levels: Record<string, string> = {};
    subset.forEach((f, k) => (levels[table.factors[f].name] = table.factors[f].levels[g.codes[k]]));
    return describePooled(g, levels, location, confLevel);
  });
}

/**
 * Descriptives overall, per level of each factor and per cell of all factors.
 * @param table cell summaries of the runs
 * @param offset decimal offset removed before the analysis (decimal-input.ts), added back here
 * @param confLevel confidence level of the CIs (default 0.95)
 * @example describe(table, 0).byLevel.tension[0].mean // mean of the runs at tension L
 */
export function describe(table: CellTable, offset: number, confLevel = 0.95): DescriptivesResult {
  const location = offset + table.shift;
  const all = table.factors.map((_, i) => i);
  const byLevel: Record<string, GroupDescriptives[]> = {};
  table.factors.forEach((f, i) => (byLevel[f.name] = describeSubset(table, [i], location, confLevel)));
  const overall = describeSubset(table, [], location, confLevel)[0];
  const byCell = table.factors.length > 0 ? describeSubset(table, all, location, confLevel) : [];
  const emptyCells = table.factors.length > 1 ? emptyCellLabels(table) : [];
  return { overall, byLevel, byCell, emptyCells, confLevel };
}
