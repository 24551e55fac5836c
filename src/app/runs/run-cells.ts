import { DECIMAL_RE } from '../../../shared/studies';
import type { RunEdit } from '../../../shared/runs';
import type { Factor, Outcome, Response, Run } from '../studies/study-types';

/**
 * What each run-sheet column holds and how a typed or pasted text becomes part of a run edit. The
 * grid editor, the paste and the conflict view all go through `cellChange`, so one value is judged
 * the same way whichever way it arrives.
 */
export type CellSpec =
  | { kind: 'value'; symbol: string; label: string; decimals: number; response: Response }
  | { kind: 'measured'; symbol: string; label: string }
  | { kind: 'outcome'; label: string }
  | { kind: 'text'; field: 'operator' | 'notes' | 'outcomeReason'; label: string; max: number }
  | { kind: 'date'; label: string }
  | { kind: 'readonly'; label: string };

export type RunChangeFields = Omit<RunEdit, 'runId' | 'version' | 'reason'>;

export const colId = {
  setting: (s: string) => `set:${s}`,
  measured: (s: string) => `meas:${s}`,
  value: (s: string) => `val:${s}`,
};

/** The editable and read-only columns of a study's sheet, keyed by column id. */
export function cellSpecs(factors: Factor[], responses: Response[]): Map<string, CellSpec> {
  const specs = new Map<string, CellSpec>();
  for (const id of ['code', 'standardOrder', 'runOrder', 'block', 'attachments', 'actions']) specs.set(id, { kind: 'readonly', label: id });
  for (const f of factors) {
    specs.set(colId.setting(f.symbol), { kind: 'readonly', label: `${f.symbol} (planned)` });
    if (f.tracksMeasured) specs.set(colId.measured(f.symbol), { kind: 'measured', symbol: f.symbol, label: `${f.symbol} measured` });
  }
  for (const r of responses) specs.set(colId.value(r.symbol), { kind: 'value', symbol: r.symbol, label: r.symbol, decimals: r.decimals, response: r });
  specs.set('outcome', { kind: 'outcome', label: 'Outcome' });
  specs.set('outcomeReason', { kind: 'text', field: 'outcomeReason', label: 'Reason', max: 1000 });
  specs.set('operator', { kind: 'text', field: 'operator', label: 'Operator', max: 120 });
  specs.set('testedOn', { kind: 'date', label: 'Tested on' });
  specs.set('notes', { kind: 'text', field: 'notes', label: 'Notes', max: 4000 });
  return specs;
}

/** Digits after the decimal point as typed ("0.850" has 3; "1e-3" counts by its mantissa). */
export function decimalsOf(text: string): number {
  const mantissa = text.split(/[eE]/)[0]!;
  const dot = mantissa.indexOf('.');
  return dot < 0 ? 0 : mantissa.length - dot - 1;
}

/** Why a decimal text cannot be stored, or null. `decimals` limits digits after the point when given. */
export function decimalProblem(text: string, decimals?: number): string | null {
  if (text === '') return null;
  if (!DECIMAL_RE.test(text)) return text.includes(',') ? `"${text}": use a point as the decimal mark` : `"${text}" is not a number`;
  if (decimals !== undefined && decimalsOf(text) > decimals) return `"${text}" has more than ${decimals} decimal${decimals === 1 ? '' : 's'}`;
  return null;
}

/** The text a run shows in a column, as stored (values keep the text typed, not a reformatted number). */
export function cellText(spec: CellSpec, run: Run, outcomes: Outcome[]): string {
  switch (spec.kind) {
    case 'value':
      return run.values[spec.symbol]?.text ?? '';
    case 'measured':
      return run.measured[spec.symbol]?.text ?? '';
    case 'outcome':
      return outcomes.find((o) => o.id === run.outcomeId)?.label ?? '';
    case 'text':
      return run[spec.field];
    case 'date':
      return run.testedOn;
    case 'readonly':
      return '';
  }
}

/** Turns the text for one cell into the fields of a run edit, or says what is wrong with it. */
export function cellChange(spec: CellSpec, raw: string, outcomes: Outcome[]): { fields: RunChangeFields } | { error: string } {
  const text = spec.kind === 'text' && spec.field === 'notes' ? raw : raw.trim();
  switch (spec.kind) {
    case 'value': {
      const problem = decimalProblem(text, spec.decimals);
      return problem ? { error: problem } : { fields: { values: { [spec.symbol]: text === '' ? null : text } } };
    }
    case 'measured': {
      const problem = decimalProblem(text);
      return problem ? { error: problem } : { fields: { measured: { [spec.symbol]: text === '' ? null : text } } };
    }
    case 'outcome': {
      if (text === '') return { fields: { outcomeId: null } };
      const match = outcomes.find((o) => o.label.toLowerCase() === text.toLowerCase());
      return match ? { fields: { outcomeId: match.id } } : { error: `"${text}" is not an outcome of this study (${outcomes.map((o) => o.label).join(', ')})` };
    }
    case 'text':
      return text.length > spec.max ? { error: `${spec.label}: use at most ${spec.max} characters` } : { fields: { [spec.field]: text } };
    case 'date':
      return text === '' || /^\d{4}-\d{2}-\d{2}$/.test(text) ? { fields: { testedOn: text } } : { error: `"${text}" is not a date like 2026-03-14` };
    case 'readonly':
      return { error: `${spec.label} cannot be edited` };
  }
}

/** Merges one cell's fields into a run edit (several pasted cells of one run become one edit). */
export function mergeFields(into: RunChangeFields, add: RunChangeFields): RunChangeFields {
  return {
    ...into,
    ...add,
    ...(add.values || into.values ? { values: { ...into.values, ...add.values } } : {}),
    ...(add.measured || into.measured ? { measured: { ...into.measured, ...add.measured } } : {}),
  };
}
