import { AbstractControl, FormGroup, ValidationErrors, ValidatorFn } from '@angular/forms';
import { ApiError } from './api-error';

/** Same rule as shared/auth.ts `newPassword` (length resists guessing; NIST SP 800-63B §5.1.1). */
export const MIN_PASSWORD_LENGTH = 12;

/** Group validator: `confirmKey` must repeat `passwordKey`; the error lands on the confirm field. */
export function sameAs(passwordKey: string, confirmKey: string): ValidatorFn {
  return (group: AbstractControl): ValidationErrors | null => {
    const password = group.get(passwordKey);
    const confirm = group.get(confirmKey);
    if (!password || !confirm) return null;
    const mismatch = confirm.value !== '' && confirm.value !== password.value;
    const others = { ...(confirm.errors ?? {}) };
    delete others['mismatch'];
    confirm.setErrors(mismatch ? { ...others, mismatch: true } : Object.keys(others).length ? others : null);
    return null;
  };
}

/**
 * Puts the server's field-level problems (ApiError.details, paths like "email") onto the matching
 * controls as a `server` error, so mat-error shows them where the user must fix them.
 * Returns true when at least one detail matched a control.
 */
export function showServerErrors(form: FormGroup, error: ApiError): boolean {
  let matched = false;
  for (const detail of error.details) {
    const control = form.get(detail.path);
    if (control) {
      control.setErrors({ ...(control.errors ?? {}), server: detail.message });
      control.markAsTouched();
      matched = true;
    }
  }
  return matched;
}

/** The text of a control's `server` error, for mat-error. */
export function serverError(control: AbstractControl): string {
  const value: unknown = control.errors?.['server'];
  return typeof value === 'string' ? value : '';
}
