import { FormControl, FormGroup, Validators } from '@angular/forms';
import type { StudyCreateBody } from '../../../shared/studies';
import type { StudyDetail } from './study-types';

/**
 * The study description form used by "New study" and the Overview tab. Limits mirror
 * shared/studies.ts `studyFields`, so the browser says what the server would refuse before the call.
 */
export function studyForm() {
  return new FormGroup({
    title: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(200)] }),
    purpose: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(4000)] }),
    specimenFamily: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(200)] }),
    materialDescription: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(4000)] }),
    materialGrade: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(120)] }),
    batch: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(120)] }),
    // Text, not number inputs: an empty field means "not stated" (null), and "1,5" gets a message instead of vanishing.
    thicknessMm: new FormControl('', { nonNullable: true, validators: [decimalIn(0.01, 100)] }),
    orientationDeg: new FormControl('', { nonNullable: true, validators: [decimalIn(0, 180)] }),
  });
}
export type StudyForm = ReturnType<typeof studyForm>;

/** A decimal number in [min, max], or empty. Errors carry the message mat-error shows. */
export function decimalIn(min: number, max: number) {
  return (control: { value: string }) => {
    const raw = control.value.trim();
    if (raw === '') return null;
    if (!/^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(raw)) return { decimal: raw.includes(',') ? `"${raw}": use a point as the decimal mark` : `"${raw}" is not a number` };
    const n = Number(raw);
    if (n < min || n > max) return { decimal: `Enter a value from ${min} to ${max}` };
    return null;
  };
}

export function studyBody(form: StudyForm): StudyCreateBody {
  const v = form.getRawValue();
  const num = (s: string) => (s.trim() === '' ? null : Number(s));
  return { ...v, thicknessMm: num(v.thicknessMm), orientationDeg: num(v.orientationDeg) };
}

export function fillStudyForm(form: StudyForm, s: StudyDetail): void {
  form.reset({
    title: s.title,
    purpose: s.purpose,
    specimenFamily: s.specimenFamily,
    materialDescription: s.materialDescription,
    materialGrade: s.materialGrade,
    batch: s.batch,
    thicknessMm: s.thicknessMm === null ? '' : String(s.thicknessMm),
    orientationDeg: s.orientationDeg === null ? '' : String(s.orientationDeg),
  });
}

/** The message for a control's first problem, worded as what to do. */
export function fieldError(control: { errors: Record<string, unknown> | null }, what: string): string {
  const e = control.errors;
  if (!e) return '';
  if (e['required']) return `Enter ${what}`;
  if (e['maxlength']) return `${what[0]!.toUpperCase()}${what.slice(1)}: use at most ${(e['maxlength'] as { requiredLength: number }).requiredLength} characters`;
  for (const key of ['decimal', 'server', 'zod', 'pattern']) if (typeof e[key] === 'string') return e[key];
  return `Check ${what}`;
}
