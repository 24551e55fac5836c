import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { ROLE_LABELS, type Role } from '../../../shared/roles';
import { ApiError } from '../core/api-error';
import { AppConfigStore } from '../core/app-config';
import { safeReturnUrl } from './auth-guard';
import { AuthStore } from './auth-store';

/** Seeded by the server when DEMO is on (see README); shown only then. */
const DEMO_PASSWORD = 'specimetry-demo';
const DEMO_ROLES: readonly Role[] = ['admin', 'engineer', 'statistician', 'supervisor'];

@Component({
  selector: 'sm-sign-in',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  templateUrl: './sign-in.html',
  styleUrl: './auth-card.scss',
})
export class SignIn {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  private readonly appConfig = inject(AppConfigStore);

  /** Where the user was when they were sent here (query parameter, bound by the router). */
  readonly returnUrl = input<string>();

  protected readonly form = inject(FormBuilder).nonNullable.group({
    email: ['', [Validators.required, Validators.email]],
    password: ['', Validators.required],
  });
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);
  protected readonly demoAccounts = computed(() =>
    this.appConfig.config().demo ? DEMO_ROLES.map((role) => ({ role, label: ROLE_LABELS[role], email: `${role}@specimetry.test` })) : [],
  );
  protected readonly comingBack = computed(() => safeReturnUrl(this.returnUrl()) !== '/studies');

  protected useDemoAccount(email: string): void {
    this.form.setValue({ email, password: DEMO_PASSWORD });
    this.failure.set(null);
  }

  protected signIn(): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.failure.set(null);
    const { email, password } = this.form.getRawValue();
    this.auth.signIn({ email: email.trim(), password }).subscribe({
      next: () => {
        this.busy.set(false);
        void this.router.navigateByUrl(safeReturnUrl(this.returnUrl()));
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.failure.set(error instanceof ApiError ? error.message : 'Sign-in failed. Try again.');
      },
    });
  }
}
