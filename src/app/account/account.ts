import { HttpClient, HttpContext } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormBuilder, FormGroupDirective, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { AuthStore } from '../auth/auth-store';
import { ApiError, ERRORS_SHOWN_INLINE } from '../core/api-error';
import { MIN_PASSWORD_LENGTH, sameAs, serverError, showServerErrors } from '../core/form-errors';
import { Notifier } from '../core/notifier';

/** The signed-in user's own account: who they are and a password change. */
@Component({
  selector: 'sm-account',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  templateUrl: './account.html',
  styleUrl: './account.scss',
})
export class Account {
  private readonly http = inject(HttpClient);
  private readonly notifier = inject(Notifier);
  private readonly auth = inject(AuthStore);

  protected readonly user = this.auth.user;
  protected readonly roleLabel = this.auth.roleLabel;
  protected readonly minLength = MIN_PASSWORD_LENGTH;
  protected readonly serverError = serverError;
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected readonly form = inject(FormBuilder).nonNullable.group(
    {
      currentPassword: ['', Validators.required],
      newPassword: ['', [Validators.required, Validators.minLength(MIN_PASSWORD_LENGTH)]],
      confirm: ['', Validators.required],
    },
    { validators: sameAs('newPassword', 'confirm') },
  );

  protected changePassword(formDirective: FormGroupDirective): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.failure.set(null);
    const { currentPassword, newPassword } = this.form.getRawValue();
    this.http
      .post<void>('/api/account/password', { currentPassword, newPassword }, { context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) })
      .subscribe({
        next: () => {
          this.busy.set(false);
          // resetForm (not form.reset) also clears "submitted", so the empty fields do not light up red.
          formDirective.resetForm();
          this.notifier.info('Your password was changed.');
        },
        error: (error: unknown) => {
          this.busy.set(false);
          if (!(error instanceof ApiError)) this.failure.set('Could not change the password. Try again.');
          else if (!showServerErrors(this.form, error)) this.failure.set(error.message);
        },
      });
  }
}
