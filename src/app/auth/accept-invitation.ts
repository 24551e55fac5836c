import { HttpClient, HttpContext, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import type { PublicUser } from '../../../shared/auth';
import { ROLE_LABELS, type Role } from '../../../shared/roles';
import { ApiError, ERRORS_SHOWN_INLINE } from '../core/api-error';
import { MIN_PASSWORD_LENGTH, sameAs, serverError, showServerErrors } from '../core/form-errors';
import { AuthStore } from './auth-store';

interface InvitationLookup {
  email: string;
  role: Role;
  name: string | null;
}

const inline = () => new HttpContext().set(ERRORS_SHOWN_INLINE, true);

/** Where an invited person lands from the e-mail link: checks the token, then sets name and password. */
@Component({
  selector: 'sm-accept-invitation',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  templateUrl: './accept-invitation.html',
  styleUrl: './auth-card.scss',
})
export class AcceptInvitation {
  private readonly http = inject(HttpClient);
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);

  /** From the link in the invitation mail (?token=…). */
  readonly token = input<string>();

  protected readonly minLength = MIN_PASSWORD_LENGTH;
  protected readonly serverError = serverError;
  protected readonly invitation = httpResource<InvitationLookup>(() => {
    const token = this.token();
    return token ? { url: '/api/invitations/lookup', params: { token }, context: inline() } : undefined;
  });
  protected readonly invalidLink = computed(() => {
    if (!this.token()) return 'This link has no invitation token. Open the link from your invitation e-mail again.';
    const error = this.invitation.error();
    if (!error) return null;
    if (error instanceof ApiError && (error.status === 404 || error.status === 410)) {
      return `${error.message} Ask your administrator to send a new invitation.`;
    }
    return error.message;
  });
  protected readonly roleLabel = computed(() => {
    const role = this.invitation.value()?.role;
    return role ? ROLE_LABELS[role] : '';
  });

  protected readonly form = inject(FormBuilder).nonNullable.group(
    {
      name: ['', [Validators.required, Validators.maxLength(120)]],
      password: ['', [Validators.required, Validators.minLength(MIN_PASSWORD_LENGTH)]],
      confirm: ['', Validators.required],
    },
    { validators: sameAs('password', 'confirm') },
  );
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);

  constructor() {
    // Pre-fill the name the administrator typed, but never overwrite what the user has started typing.
    effect(() => {
      const name = this.invitation.value()?.name;
      if (name && this.form.controls.name.pristine) this.form.controls.name.setValue(name);
    });
  }

  protected acceptInvitation(): void {
    const token = this.token();
    if (!token || this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.failure.set(null);
    const { name, password } = this.form.getRawValue();
    this.http
      .post<{ user: PublicUser }>('/api/invitations/accept', { token, name: name.trim(), password }, { context: inline() })
      .subscribe({
        next: ({ user }) => {
          this.auth.setUser(user);
          void this.router.navigateByUrl('/studies');
        },
        error: (error: unknown) => {
          this.busy.set(false);
          if (error instanceof ApiError) {
            if (!showServerErrors(this.form, error)) this.failure.set(error.message);
          } else {
            this.failure.set('Could not accept the invitation. Try again.');
          }
        },
      });
  }
}
