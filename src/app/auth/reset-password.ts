import { HttpClient, HttpContext } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { FormBuilder, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { ApiError, ERRORS_SHOWN_INLINE } from '../core/api-error';
import { MIN_PASSWORD_LENGTH, sameAs, serverError, showServerErrors } from '../core/form-errors';
import { Notifier } from '../core/notifier';

const inline = () => new HttpContext().set(ERRORS_SHOWN_INLINE, true);

/**
 * Without ?token: asks for the e-mail address and sends a reset link. With ?token (the link from
 * that mail): sets the new password.
 */
@Component({
  selector: 'sm-reset-password',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  templateUrl: './reset-password.html',
  styleUrl: './auth-card.scss',
})
export class ResetPassword {
  private readonly http = inject(HttpClient);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);
  private readonly fb = inject(FormBuilder).nonNullable;

  readonly token = input<string>();

  protected readonly minLength = MIN_PASSWORD_LENGTH;
  protected readonly serverError = serverError;
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);
  /** The server's answer to a request; it is the same whether or not the account exists. */
  protected readonly sent = signal<string | null>(null);

  protected readonly requestForm = this.fb.group({
    email: ['', [Validators.required, Validators.email]],
  });
  protected readonly newPasswordForm = this.fb.group(
    {
      password: ['', [Validators.required, Validators.minLength(MIN_PASSWORD_LENGTH)]],
      confirm: ['', Validators.required],
    },
    { validators: sameAs('password', 'confirm') },
  );

  protected requestLink(): void {
    if (this.requestForm.invalid) {
      this.requestForm.markAllAsTouched();
      return;
    }
    this.start();
    const email = this.requestForm.getRawValue().email.trim();
    this.http.post<{ message: string }>('/api/auth/password-reset', { email }, { context: inline() }).subscribe({
      next: (res) => {
        this.busy.set(false);
        this.sent.set(res.message);
      },
      error: (error: unknown) => this.fail(error, this.requestForm),
    });
  }

  protected setPassword(): void {
    const token = this.token();
    if (!token || this.newPasswordForm.invalid) {
      this.newPasswordForm.markAllAsTouched();
      return;
    }
    this.start();
    const { password } = this.newPasswordForm.getRawValue();
    this.http.post<void>('/api/auth/password-reset/confirm', { token, password }, { context: inline() }).subscribe({
      next: () => {
        this.busy.set(false);
        this.notifier.info('Your password was changed. Sign in with the new one.');
        void this.router.navigate(['/sign-in']);
      },
      error: (error: unknown) => this.fail(error, this.newPasswordForm),
    });
  }

  private start(): void {
    this.busy.set(true);
    this.failure.set(null);
  }

  /** Field problems go onto the fields; anything else (expired link, rate limit) into the note. */
  private fail(error: unknown, form: FormGroup): void {
    this.busy.set(false);
    if (!(error instanceof ApiError)) {
      this.failure.set('The request failed. Try again.');
    } else if (!showServerErrors(form, error)) {
      this.failure.set(error.message);
    }
  }
}
