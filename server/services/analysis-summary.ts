import type { AnalysisResult, AnovaEffectRow, PosthocTerm, Readings, RunCounts } from '../../shared/analysis.js';
import { fSentence } from '../stats/anova-one-way.js';
import { formatP } from '../stats/distributions.js';

/**
 * The plain-language summary paragraph and the short reading per result panel. Words follow the
 * numbers, never the other way round: every claim carries the statistic it rests on, so a reader can
 * check it against the tables.
 */

export const CAUTION_SENTENCE =
  'Statistics inform; they do not replace qualified engineering judgement, the applicable test standards, or local codes and licensed practice.';

/** Four significant digits, no exponent for ordinary magnitudes. */
export function num(x: number | null | undefined, sig = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  if (x === 0) return '0';
  return Math.abs(x) >= 1e6 || Math.abs(x) < 1e-3 ? x.toExponential(sig - 1) : String(Number(x.toPrecision(sig)));
}

/**
 * Partial eta-squared size words by Cohen's conventional thresholds for eta-squared (0.01 small,
 * 0.06 medium, 0.14 large; Cohen 1988, from memory). They are conventions, not laws of the trade.
 */
export function sizeWord(pe2: number): string {
  if (pe2 >= 0.14) return 'large';
  if (pe2 >= 0.06) return 'medium';
  if (pe2 >= 0.01) return 'small';
  return 'negligible';
}

/** How strong the evidence is, in words, relative to the chosen alpha. */
export function evidenceWord(p: number, alpha: number): string {
  if (p < Math.min(0.001, alpha / 10)) return 'very strong evidence';
  if (p < Math.min(0.01, alpha / 2)) return 'strong evidence';
  if (p < alpha) return 'evidence';
  if (p < 2 * alpha) return 'only a weak hint';
  return 'no clear evidence';
}

export function effectRows(result: AnalysisResult): AnovaEffectRow[] {
  return result.anova.filter((r): r is AnovaEffectRow => r.source !== 'Residual');
}

function rowText(r: AnovaEffectRow, residualDf: number): string {
  return `${r.source} (${fSentence(r.f, r.df, residualDf, r.p)}, partial η² = ${num(r.partialEtaSq, 3)}, ${sizeWord(r.partialEtaSq)})`;
}

export function countsSentence(c: RunCounts): string {
  const parts: string[] = [];
  if (c.excludedInvalid) parts.push(`${c.excludedInvalid} invalid excluded (${c.byReason.map((r) => `${r.outcome}: ${r.count}`).join(', ')})`);
  if (c.invalidIncluded) parts.push(`${c.invalidIncluded} invalid kept in on request`);
  if (c.missingValue) parts.push(`${c.missingValue} without a value`);
  if (c.removed) parts.push(`${c.removed} removed`);
  if (c.centrePoints) parts.push(`${c.centrePoints} centre points left out`);
  return `${c.used} of ${c.total} runs used${parts.length ? `; ${parts.join('; ')}` : ''}`;
}

/** The summary paragraph: which effects matter, how large (partial η²), how sure (p), with the numbers. */
export function summaryParagraph(result: AnalysisResult, counts: RunCounts, alpha: number, responseLabel: string): string {
  const rows = effectRows(result);
  const df = result.model.residualDf;
  const sig = rows.filter((r) => r.p < alpha).sort((a, b) => b.partialEtaSq - a.partialEtaSq);
  const rest = rows.filter((r) => !(r.p < alpha));
  const out: string[] = [];
  out.push(`${countsSentence(counts)}. The model (${result.terms.join(' + ') || 'mean only'}, Type ${['I', 'II', 'III'][result.ssType - 1]} sums of squares) explains R² = ${num(result.model.rSquared, 3)} of the variation in ${responseLabel}; the residual standard deviation is ${num(result.model.residualSd)}.`);
  if (sig.length) {
    out.push(`At α = ${alpha}, there is ${sig.map((r) => `${evidenceWord(r.p, alpha)} for ${rowText(r, df)}`).join('; ')}.`);
  } else if (rows.length) {
    out.push(`At α = ${alpha}, no term reaches significance.`);
  }
  if (rest.length) out.push(`${rest.map((r) => `${r.source}: ${evidenceWord(r.p, alpha)} (${formatP(r.p)}, partial η² = ${num(r.partialEtaSq, 3)})`).join('; ')}.`);
  const inter = sig.filter((r) => r.source.includes(':'));
  if (inter.length) {
    const mains = [...new Set(inter.flatMap((r) => r.source.split(':')))];
    out.push(`Because ${inter.map((r) => r.source).join(' and ')} matter${inter.length === 1 ? 's' : ''}, the effect of ${mains.join(' and of ')} depends on the other factor's level: read the main effects through the interaction plot, not on their own.`);
  }
  if (result.omitted.length) out.push(`Not estimable: ${result.omitted.map((o) => `${o.source} (${o.reason})`).join('; ')}.`);
  const flagged = assumptionFailures(result, alpha);
  if (flagged.length) out.push(`Assumption checks flag ${flagged.join(' and ')}; see the assumption panel before relying on the p-values.`);
  out.push(`A p-value says how surprising the data would be if a term had no effect; it is not the size or the importance of the effect. ${CAUTION_SENTENCE}`);
  return out.join(' ');
}

function assumptionFailures(result: AnalysisResult, alpha: number): string[] {
  const t = result.tests;
  const out: string[] = [];
  const variance = [t.levene, t.brownForsythe].some((x) => x && x.p < alpha) || (t.bartlett && t.bartlett.p < alpha);
  if (variance) out.push('unequal scatter between cells');
  if (t.shapiro && t.shapiro.p < alpha) out.push('non-normal residuals');
  return out;
}

function descriptivesReading(result: AnalysisResult): string {
  const cells = result.descriptives.byCell;
  if (!cells.length) return 'No cells to describe.';
  const ns = cells.map((c) => c.n);
  const hi = cells.reduce((a, b) => (b.mean > a.mean ? b : a));
  const lo = cells.reduce((a, b) => (b.mean < a.mean ? b : a));
  const empty = result.descriptives.emptyCells.length;
  return `${cells.length} cells with ${Math.min(...ns) === Math.max(...ns) ? `${ns[0]} runs each` : `${Math.min(...ns)} to ${Math.max(...ns)} runs`}${empty ? ` and ${empty} empty` : ''}. Highest mean ${num(hi.mean)} at ${hi.label}, lowest ${num(lo.mean)} at ${lo.label}; overall mean ${num(result.descriptives.overall.mean)} (SD ${num(result.descriptives.overall.sd)}). The 95 % CIs are per cell, not comparisons.`;
}

function anovaReading(result: AnalysisResult, alpha: number): string {
  const rows = effectRows(result);
  const sig = rows.filter((r) => r.p < alpha);
  if (!rows.length) return 'No model terms were fitted.';
  const biggest = rows.reduce((a, b) => (b.partialEtaSq > a.partialEtaSq ? b : a));
  return `${sig.length} of ${rows.length} terms are significant at α = ${alpha} (marked ★ in the table). The largest effect is ${biggest.source} with partial η² = ${num(biggest.partialEtaSq, 3)} (${sizeWord(biggest.partialEtaSq)}). Partial η² is the share of the variation left after the other terms that this term accounts for; it is not additive across terms.`;
}

function assumptionsReading(result: AnalysisResult, alpha: number): string {
  const t = result.tests;
  const parts: string[] = [];
  const vt: string[] = [];
  if (t.levene) vt.push(`Levene F = ${num(t.levene.f)}, ${formatP(t.levene.p)}`);
  if (t.brownForsythe) vt.push(`Brown–Forsythe F = ${num(t.brownForsythe.f)}, ${formatP(t.brownForsythe.p)}`);
  if (t.bartlett) vt.push(`Bartlett χ² = ${num(t.bartlett.statistic)}, ${formatP(t.bartlett.p)}`);
  const unequal = [t.levene, t.brownForsythe].some((x) => x && x.p < alpha) || Boolean(t.bartlett && t.bartlett.p < alpha);
  if (vt.length) {
    parts.push(unequal
      ? `The scatter differs between cells (${vt.join('; ')}): the pooled F tests can mislead, most of all with unequal run counts.`
      : `No sign of unequal scatter between cells (${vt.join('; ')}), so pooling the variance for the F tests is reasonable.`);
  }
  if (t.shapiro) {
    parts.push(t.shapiro.p < alpha
      ? `The residuals depart from normality (Shapiro–Wilk W = ${num(t.shapiro.w)}, ${formatP(t.shapiro.p)}); check the Q-Q plot for outliers or skew — the F test tolerates mild departures in balanced designs.`
      : `The residuals are consistent with a normal distribution (Shapiro–Wilk W = ${num(t.shapiro.w)}, ${formatP(t.shapiro.p)}).`);
  }
  if (unequal || (t.shapiro && t.shapiro.p < alpha)) {
    const alt: string[] = [];
    if (t.welch) alt.push(`Welch's ANOVA over the cells F(${num(t.welch.df1)}, ${num(t.welch.df2)}) = ${num(t.welch.f)}, ${formatP(t.welch.p)}`);
    if (t.kruskal) alt.push(`Kruskal–Wallis H = ${num(t.kruskal.statistic)}, df = ${t.kruskal.df}, ${formatP(t.kruskal.p)}`);
    if (alt.length) parts.push(`Alongside, tests that do not need that assumption compare the cells: ${alt.join('; ')}. Where they agree with the ANOVA, its conclusions hold up.`);
  }
  return parts.join(' ') || 'No assumption checks were run.';
}

function posthocReading(posthoc: PosthocTerm[], alpha: number): string {
  if (!posthoc.length) return 'No term is significant, so no pairwise comparisons are shown: differences between levels are within what the scatter explains.';
  const parts = posthoc.map((t) => {
    const sig = t.comparisons.filter((c) => c.p < alpha);
    const widest = t.comparisons.reduce((a, b) => (Math.abs(b.diff) > Math.abs(a.diff) ? b : a));
    return `${t.term}: ${sig.length} of ${t.comparisons.length} pairs differ; the largest difference is ${widest.b} − ${widest.a} = ${num(widest.diff)} [${num(widest.lower)}, ${num(widest.upper)}], adjusted ${formatP(widest.p)}`;
  });
  return `Tukey HSD with the model's residual mean square, simultaneous ${num(100 * (1 - alpha), 3)} % intervals. ${parts.join('. ')}. An interval that excludes 0 marks a difference.`;
}

function dispersionReading(result: AnalysisResult, alpha: number): string {
  const d = result.dispersion;
  if (!d) return 'No dispersion analysis was run.';
  const tests = d.varianceTests
    .filter((t) => t.brownForsythe !== null)
    .sort((a, b) => a.brownForsythe!.p - b.brownForsythe!.p);
  const parts: string[] = [];
  if (tests.length) {
    const top = tests[0]!;
    const bf = top.brownForsythe!;
    parts.push(bf.p < alpha
      ? `${top.factor} drives the scatter: within-cell spread differs between its levels (Brown–Forsythe F(${bf.df1}, ${bf.df2}) = ${num(bf.f)}, ${formatP(bf.p)}).`
      : `No factor clearly drives the scatter; the strongest sign is ${top.factor} (Brown–Forsythe F(${bf.df1}, ${bf.df2}) = ${num(bf.f)}, ${formatP(bf.p)}).`);
  }
  const best = d.ranking.filter((r) => r.rank !== null).slice(0, 3);
  if (best.length) {
    const label = (k: Record<string, string>) => result.factors.map((f) => `${f}=${k[f]}`).join(', ');
    parts.push(`Best settings (ranked by ${d.rankingRule}): ${best.map((b) => `${b.rank}. ${label(b.key)}`).join('; ')}.`);
  }
  parts.push('An SD from a handful of runs is itself uncertain: treat the ranking as a shortlist for confirmation runs.');
  return parts.join(' ');
}

export function readingsFor(result: AnalysisResult, alpha: number, posthoc: PosthocTerm[] = []): Readings {
  return {
    descriptives: descriptivesReading(result),
    anova: anovaReading(result, alpha),
    notes: result.notes.length ? `${result.notes.length} note${result.notes.length === 1 ? '' : 's'} from the engine about the design and the fit; read them before the numbers.` : 'The engine raised no notes about the design or the fit.',
    assumptions: assumptionsReading(result, alpha),
    posthoc: posthocReading(posthoc, alpha),
    dispersion: dispersionReading(result, alpha),
  };
}
