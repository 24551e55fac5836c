import { AbstractControl, FormArray, FormControl, FormGroup, Validators } from '@angular/forms';
import type { z } from 'zod';
import { DECIMAL_RE, type FactorInput, type OutcomesBody, type ResponseInput } from '../../../shared/studies';
import type { Factor, Outcome, Response, ResponseGoal } from './study-types';

/**
 * Typed forms for the set-up tab and their conversion to the shared request bodies. Live checks use
 * Angular validators; on save the shared zod schema runs over the whole list, and its messages
 * (duplicates, non-numeric levels, a nominal goal without target) land on the control they name.
 */

const SYMBOL_RE = /^[A-Za-z][A-Za-z0-9_]{0,23}$/;

/** Optional decimal typed as text: empty is "not set" (null); a comma gets its own message. */
export function optionalDecimal(control: AbstractControl<string>) {
  const raw = control.value.trim();
  if (raw === '' || DECIMAL_RE.test(raw)) return null;
  return { zod: raw.includes(',') ? `"${raw}": use a point as the decimal mark` : `"${raw}" is not a number` };
}

export function levelGroup(value = '', label = '') {
  return new FormGroup({
    value: new FormControl(value, { nonNullable: true, validators: [Validators.required, Validators.maxLength(60)] }),
    label: new FormControl(label, { nonNullable: true, validators: [Validators.maxLength(120)] }),
  });
}
export type LevelGroup = ReturnType<typeof levelGroup>;

export function factorGroup(f?: Factor) {
  return new FormGroup({
    id: new FormControl<number | null>(f?.id ?? null),
    name: new FormControl(f?.name ?? '', { nonNullable: true, validators: [Validators.required, Validators.maxLength(120)] }),
    symbol: new FormControl(f?.symbol ?? '', { nonNullable: true, validators: [Validators.required, Validators.pattern(SYMBOL_RE)] }),
    unit: new FormControl(f?.unit ?? '', { nonNullable: true, validators: [Validators.maxLength(40)] }),
    kind: new FormControl<'numeric' | 'categorical'>(f?.kind ?? 'numeric', { nonNullable: true }),
    tracksMeasured: new FormControl(f?.tracksMeasured ?? false, { nonNullable: true }),
    levels: new FormArray((f?.levels ?? [{ value: '' }, { value: '' }]).map((l) => levelGroup(l.value, l.label ?? ''))),
  });
}
export type FactorGroup = ReturnType<typeof factorGroup>;

export function responseGroup(r?: Response) {
  const text = (n: number | null | undefined) => (n === null || n === undefined ? '' : String(n));
  return new FormGroup({
    id: new FormControl<number | null>(r?.id ?? null),
    name: new FormControl(r?.name ?? '', { nonNullable: true, validators: [Validators.required, Validators.maxLength(120)] }),
    symbol: new FormControl(r?.symbol ?? '', { nonNullable: true, validators: [Validators.required, Validators.pattern(SYMBOL_RE)] }),
    unit: new FormControl(r?.unit ?? '', { nonNullable: true, validators: [Validators.maxLength(40)] }),
    decimals: new FormControl(r?.decimals ?? 3, { nonNullable: true, validators: [Validators.required, Validators.min(0), Validators.max(10)] }),
    goal: new FormControl<ResponseGoal>(r?.goal ?? 'larger', { nonNullable: true }),
    target: new FormControl(text(r?.target), { nonNullable: true, validators: [optionalDecimal] }),
    rangeMin: new FormControl(text(r?.rangeMin), { nonNullable: true, validators: [optionalDecimal] }),
    rangeMax: new FormControl(text(r?.rangeMax), { nonNullable: true, validators: [optionalDecimal] }),
  });
}
export type ResponseGroup = ReturnType<typeof responseGroup>;

export function outcomeGroup(o?: Outcome) {
  return new FormGroup({
    id: new FormControl<number | null>(o?.id ?? null),
    label: new FormControl(o?.label ?? '', { nonNullable: true, validators: [Validators.required, Validators.maxLength(120)] }),
    valid: new FormControl(o?.valid ?? false, { nonNullable: true }),
  });
}
export type OutcomeGroup = ReturnType<typeof outcomeGroup>;

const num = (s: string) => (s.trim() === '' ? null : Number(s));
const withId = <T extends object>(id: number | null, rest: T) => (id === null ? rest : { ...rest, id });

export function factorsValue(list: FormArray<FactorGroup>): { factors: FactorInput[] } {
  return {
    factors: list.getRawValue().map(({ id, levels, ...f }) =>
      withId(id, { ...f, tracksMeasured: f.kind === 'numeric' && f.tracksMeasured, levels: levels.map((l) => (l.label.trim() ? { value: l.value, label: l.label } : { value: l.value })) }),
    ),
  };
}

export function responsesValue(list: FormArray<ResponseGroup>): { responses: ResponseInput[] } {
  return {
    responses: list.getRawValue().map(({ id, target, rangeMin, rangeMax, ...r }) =>
      withId(id, { ...r, target: r.goal === 'nominal' ? num(target) : null, rangeMin: num(rangeMin), rangeMax: num(rangeMax) }),
    ),
  };
}

export function outcomesValue(list: FormArray<OutcomeGroup>): OutcomesBody {
  return { outcomes: list.getRawValue().map(({ id, ...o }) => withId(id, o)) };
}

/**
 * Runs `schema` over `value` and puts each issue on the control at its path inside `root` (the path
 * starts with the list's key, e.g. ["factors", 0, "levels", 1, "value"]). Returns the messages that
 * have no control to sit on (e.g. "At least one outcome must be valid"), for a note above the list.
 */
export function applySchema(schema: z.ZodType, value: unknown, root: FormGroup): { ok: boolean; unplaced: string[] } {
  const result = schema.safeParse(value);
  if (result.success) return { ok: true, unplaced: [] };
  const unplaced: string[] = [];
  for (const issue of result.error.issues) {
    const path = issue.path.filter((p): p is string | number => typeof p !== 'symbol');
    const control = path.length > 1 ? root.get(path) : null;
    if (control && !(control instanceof FormArray)) {
      control.setErrors({ ...(control.errors ?? {}), zod: issue.message });
      control.markAsTouched();
    } else unplaced.push(issue.message);
  }
  return { ok: false, unplaced };
}

/** The mat-error text for a set-up control: what to fix, in words. */
export function setupError(control: AbstractControl, what: string): string {
  const e = control.errors;
  if (!e) return '';
  if (typeof e['zod'] === 'string') return e['zod'];
  if (typeof e['server'] === 'string') return e['server'];
  if (e['required']) return `Enter ${what}`;
  if (e['pattern']) return 'Start with a letter, then letters, digits or _ (at most 24)';
  if (e['maxlength']) return `Use at most ${(e['maxlength'] as { requiredLength: number }).requiredLength} characters`;
  if (e['min'] || e['max']) return 'Use 0 to 10 decimals';
  return `Check ${what}`;
}
