import type { StudyForAnalysis } from './analysis-api';

/** symbol -> name for the study's factors, used wherever a term is shown in words. */
export function factorNames(study: StudyForAnalysis | undefined): Record<string, string> {
  return Object.fromEntries((study?.factors ?? []).map((f) => [f.symbol, f.name]));
}

/** "Hill parameter H (–)" style label of a response for chart axes. */
export function responseLabel(study: StudyForAnalysis | undefined, symbol: string): string {
  const r = study?.responses.find((x) => x.symbol === symbol);
  if (!r) return symbol;
  return r.unit ? `${r.name} (${r.unit})` : r.name;
}

/** Who may save an analysis (docs/api-analysis.md: owner, contributor, reviewer; admins pass study checks). */
export function maySave(study: StudyForAnalysis | undefined): boolean {
  return study !== undefined && ['owner', 'contributor', 'reviewer', 'admin'].includes(study.myRole);
}
