import type { Factor, ImportPreview, Response } from '../studies/study-types';

export interface TargetOption {
  value: string;
  label: string;
}

/** The places an import column can go (shared/runs.ts `importTarget`), named for people. */
export function importTargets(factors: Factor[], responses: Response[]): TargetOption[] {
  return [
    { value: 'ignore', label: 'Ignore this column' },
    { value: 'run', label: 'Run id' },
    ...factors.map((f) => ({ value: `factor:${f.symbol}`, label: `Setting of ${f.symbol} (finds the run)` })),
    ...factors.filter((f) => f.tracksMeasured).map((f) => ({ value: `measured:${f.symbol}`, label: `${f.symbol} measured` })),
    ...responses.map((r) => ({ value: `response:${r.symbol}`, label: `Response ${r.symbol}${r.unit ? ' (' + r.unit + ')' : ''}` })),
    { value: 'outcome', label: 'Outcome' },
    { value: 'outcomeReason', label: 'Outcome reason' },
    { value: 'operator', label: 'Operator' },
    { value: 'testedOn', label: 'Tested on (date)' },
    { value: 'notes', label: 'Notes' },
  ];
}

/** One readable line per sample row: "H = 1.234, outcome #2". */
export function describeChanges(changes: ImportPreview['sample'][number]['changes']): string {
  const parts: string[] = [];
  for (const [k, v] of Object.entries(changes.values ?? {})) parts.push(`${k} = ${v ?? '(clear)'}`);
  for (const [k, v] of Object.entries(changes.measured ?? {})) parts.push(`${k} measured = ${v ?? '(clear)'}`);
  if (changes.outcomeId !== undefined) parts.push(`outcome #${changes.outcomeId ?? '(clear)'}`);
  if (changes.outcomeReason) parts.push(`reason “${changes.outcomeReason}”`);
  if (changes.operator) parts.push(`operator ${changes.operator}`);
  if (changes.testedOn) parts.push(`tested ${changes.testedOn}`);
  if (changes.notes) parts.push(`notes “${changes.notes}”`);
  return parts.join(', ') || 'no change';
}
