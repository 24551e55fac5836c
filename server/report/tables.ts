import type { AnovaEffectRow } from '../stats/types.js';
import type { ReportModel } from '../services/report.js';

/**
 * The report's tables as rows of text, built once for both the printable page and the PDF, so the
 * two cannot disagree. Statistics are printed to six significant digits (enough to compare with a
 * reference to 1e-5 relative), p-values to three.
 */

export interface Table {
  id: string;
  title: string;
  headers: string[];
  rows: string[][];
  /** indices of rows to emphasise (significant terms) */
  marked?: number[];
  note?: string;
}

export function n6(x: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1e9 || a < 1e-4 ? x.toExponential(5) : String(Number(x.toPrecision(6)));
}

export function p3(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return '–';
  if (p < 1e-16) return '< 1e-16';
  // toPrecision keeps trailing zeros ("0.0210"), so the printed digits are the significant ones.
  return p < 0.001 ? p.toExponential(2) : p.toPrecision(3);
}

export function dateText(ms: number): string {
  return new Date(ms).toISOString().replace('T', ' ').slice(0, 16) + ' UTC';
}

export function anovaTable(m: ReportModel): Table {
  const alpha = m.design.alpha;
  const rows: string[][] = [];
  const marked: number[] = [];
  m.result.anova.forEach((r, i) => {
    if (r.source === 'Residual') rows.push(['Residual', String(r.df), n6(r.ss), n6(r.ms), '', '', '']);
    else {
      const e = r as AnovaEffectRow;
      const sig = e.p < alpha;
      if (sig) marked.push(i);
      rows.push([`${e.source}${sig ? ' *' : ''}`, String(e.df), n6(e.ss), n6(e.ms), n6(e.f), p3(e.p), n6(e.partialEtaSq)]);
    }
  });
  for (const o of m.result.omitted) rows.push([o.source, '', '', '', '', '', `not estimable: ${o.reason}`]);
  return {
    id: 'anova',
    title: `ANOVA of ${m.design.response.symbol} (Type ${['I', 'II', 'III'][m.result.ssType - 1]} sums of squares)`,
    headers: ['Source', 'df', 'SS', 'MS', 'F', 'p', 'partial η²'],
    rows,
    marked,
    note: `* marks a term with p < ${alpha}. R² = ${n6(m.result.model.rSquared)}, residual SD = ${n6(m.result.model.residualSd)}.`,
  };
}

export function countsTable(m: ReportModel): Table {
  const c = m.counts;
  const rows: string[][] = [['runs in the study', String(c.total)], ['used in this analysis', String(c.used)]];
  for (const r of c.byReason) rows.push([`excluded, invalid: ${r.outcome}`, String(r.count)]);
  if (c.invalidIncluded) rows.push(['invalid but kept in (on request)', String(c.invalidIncluded)]);
  rows.push(['no value for the response', String(c.missingValue)], ['removed', String(c.removed)]);
  if (c.centrePoints) rows.push(['centre points (left out)', String(c.centrePoints)]);
  return { id: 'counts', title: 'Runs', headers: ['', 'count'], rows };
}

export function designTable(m: ReportModel): Table {
  return {
    id: 'design',
    title: 'Design',
    headers: ['Factor', 'Name', 'Kind', 'Levels'],
    rows: m.design.factors.map((f) => [f.symbol, f.unit ? `${f.name} (${f.unit})` : f.name, f.kind, f.levels.join(', ')]),
    note: `Response ${m.design.response.symbol}: ${m.design.response.name}${m.design.response.unit ? ` (${m.design.response.unit})` : ''}. Model terms: ${m.design.terms.join(', ')}. α = ${m.design.alpha}; invalid runs ${m.design.excludeInvalid ? 'excluded' : 'included'}.`,
  };
}

export function descriptiveTables(m: ReportModel): Table[] {
  const head = ['Group', 'n', 'mean', 'SD', 'CV', 'min', 'max', '95% CI'];
  const row = (g: ReportModel['result']['descriptives']['overall']) => [g.label, String(g.n), n6(g.mean), n6(g.sd), n6(g.cv), n6(g.min), n6(g.max), g.ciLower === null ? '–' : `${n6(g.ciLower)} to ${n6(g.ciUpper)}`];
  const out: Table[] = Object.entries(m.result.descriptives.byLevel).map(([factor, groups]) => ({ id: `descriptives:${factor}`, title: `Descriptives by ${factor}`, headers: head, rows: groups.map(row) }));
  out.push({
    id: 'descriptives:cells',
    title: 'Descriptives per cell',
    headers: head,
    rows: m.result.descriptives.byCell.map(row),
    note: m.result.descriptives.emptyCells.length ? `Empty cells: ${m.result.descriptives.emptyCells.join(', ')}` : undefined,
  });
  return out;
}

export function tukeyTables(m: ReportModel): Table[] {
  return m.posthoc.map((t) => ({
    id: `tukey:${t.term}`,
    title: `Tukey HSD for ${t.term} (${n6(100 * t.confLevel)} % simultaneous intervals, MSE ${n6(t.mse)} on ${t.df} df)`,
    headers: ['Comparison', 'difference', 'lower', 'upper', 'adjusted p'],
    rows: t.comparisons.map((c) => [`${c.b} − ${c.a}`, n6(c.diff), n6(c.lower), n6(c.upper), p3(c.p)]),
    marked: t.comparisons.flatMap((c, i) => (c.p < m.design.alpha ? [i] : [])),
  }));
}

export function assumptionTable(m: ReportModel): Table {
  const t = m.result.tests;
  const rows: string[][] = [];
  if (t.levene) rows.push(['Levene (mean-centred), over the cells', `F(${t.levene.df1}, ${t.levene.df2}) = ${n6(t.levene.f)}`, p3(t.levene.p)]);
  if (t.brownForsythe) rows.push(['Brown–Forsythe (median-centred)', `F(${t.brownForsythe.df1}, ${t.brownForsythe.df2}) = ${n6(t.brownForsythe.f)}`, p3(t.brownForsythe.p)]);
  if (t.bartlett) rows.push(['Bartlett', `χ²(${t.bartlett.df}) = ${n6(t.bartlett.statistic)}`, p3(t.bartlett.p)]);
  if (t.shapiro) rows.push(['Shapiro–Wilk on residuals', `W = ${n6(t.shapiro.w)}`, p3(t.shapiro.p)]);
  if (t.welch) rows.push(['Welch ANOVA over the cells', `F(${n6(t.welch.df1)}, ${n6(t.welch.df2)}) = ${n6(t.welch.f)}`, p3(t.welch.p)]);
  if (t.kruskal) rows.push(['Kruskal–Wallis over the cells', `H(${t.kruskal.df}) = ${n6(t.kruskal.statistic)}`, p3(t.kruskal.p)]);
  return { id: 'assumptions', title: 'Assumption checks and alternatives', headers: ['Test', 'statistic', 'p'], rows, marked: rows.flatMap((r, i) => (Number(r[2]) < m.design.alpha || r[2]!.startsWith('<') ? [i] : [])) };
}

export function dispersionTables(m: ReportModel): Table[] {
  const d = m.result.dispersion;
  if (!d) return [];
  const label = (k: Record<string, string>) => m.result.factors.map((f) => `${f}=${k[f]}`).join(', ');
  const cell = new Map(d.cells.map((c) => [label(c.key), c]));
  return [
    {
      id: 'dispersion:tests',
      title: 'Which factor drives the scatter (within-cell spread by factor level)',
      headers: ['Factor', 'Levene F', 'p', 'Brown–Forsythe F', 'p'],
      rows: d.varianceTests.map((t) => [t.factor, n6(t.levene?.f), p3(t.levene?.p), n6(t.brownForsythe?.f), p3(t.brownForsythe?.p)]),
      marked: d.varianceTests.flatMap((t, i) => (t.brownForsythe && t.brownForsythe.p < m.design.alpha ? [i] : [])),
    },
    {
      id: 'dispersion:ranking',
      title: `Settings ranked by ${d.rankingRule}`,
      headers: ['Rank', 'Setting', 'n', 'mean', 'SD', 'S/N nominal (dB)', 'loss'],
      rows: d.ranking.slice(0, 10).map((r) => {
        const c = cell.get(label(r.key));
        return [r.rank === null ? '–' : String(r.rank), label(r.key), String(c?.n ?? ''), n6(c?.mean), n6(c?.sd), n6(c?.signalToNoise.nominal), n6(r.loss)];
      }),
      note: 'An SD from a handful of runs is itself uncertain; confirm a chosen setting with new runs.',
    },
  ];
}

export function allTables(m: ReportModel): Table[] {
  const out = [designTable(m), countsTable(m), anovaTable(m), ...descriptiveTables(m)];
  out.push(...tukeyTables(m), assumptionTable(m), ...dispersionTables(m));
  return out;
}
