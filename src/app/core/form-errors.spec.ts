import { FormControl, FormGroup } from '@angular/forms';
import { describe, expect, it } from 'vitest';
import { ApiError } from './api-error';
import { sameAs, serverError, showServerErrors } from './form-errors';

describe('sameAs', () => {
  const form = () =>
    new FormGroup({ password: new FormControl('', { nonNullable: true }), confirm: new FormControl('', { nonNullable: true }) }, { validators: sameAs('password', 'confirm') });

  it('flags a confirmation that differs, on the confirm field', () => {
    const f = form();
    f.setValue({ password: 'a long passphrase', confirm: 'a long passphrasf' });
    expect(f.controls.confirm.hasError('mismatch')).toBe(true);
  });

  it('clears the flag once both match', () => {
    const f = form();
    f.setValue({ password: 'a long passphrase', confirm: 'x' });
    f.setValue({ password: 'a long passphrase', confirm: 'a long passphrase' });
    expect(f.controls.confirm.errors).toBeNull();
    expect(f.valid).toBe(true);
  });
});

describe('showServerErrors', () => {
  it('puts server field messages on the matching controls and reports whether any matched', () => {
    const f = new FormGroup({ email: new FormControl('x@y.z', { nonNullable: true }) });
    // API contract (issue 2): details [{path, message}] from zod validation.
    const matched = showServerErrors(f, new ApiError(400, 'Invalid', [{ path: 'email', message: 'This address already has an account' }]));
    expect(matched).toBe(true);
    expect(serverError(f.controls.email)).toBe('This address already has an account');
    expect(showServerErrors(f, new ApiError(400, 'Invalid', [{ path: 'other', message: 'x' }]))).toBe(false);
  });
});
