import { DatePipe } from '@angular/common';
import { HttpClient, HttpContext, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormBuilder, FormGroupDirective, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { ROLES, ROLE_LABELS, type Role } from '../../../shared/roles';
import { ApiError, ERRORS_SHOWN_INLINE } from '../core/api-error';
import { AppConfigStore } from '../core/app-config';
import { serverError, showServerErrors } from '../core/form-errors';
import { INVITATION_STATUS_LABELS, invitationStatus } from './invitation-status';

export interface Invitation {
  id: number;
  email: string;
  name: string | null;
  role: Role;
  expiresAt: string;
  acceptedAt: string | null;
  revokedAt: string | null;
  createdAt: string;
}

/** Administrators invite people by e-mail; the mail carries a single-use link to set name and password. */
@Component({
  selector: 'sm-invitations',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DatePipe,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTableModule,
  ],
  templateUrl: './invitations.html',
  styleUrl: './admin.scss',
})
export class Invitations {
  private readonly http = inject(HttpClient);
  private readonly appConfig = inject(AppConfigStore);
  protected readonly mailFake = computed(() => this.appConfig.config().mailFake);

  protected readonly invitations = httpResource<{ invitations: Invitation[] }>(() => '/api/invitations');
  protected readonly rows = computed(() => {
    const now = Date.now();
    const list = this.invitations.hasValue() ? this.invitations.value().invitations : [];
    return list.map((inv) => {
      const status = invitationStatus(inv, now);
      return { ...inv, status, statusLabel: INVITATION_STATUS_LABELS[status], roleLabel: ROLE_LABELS[inv.role] };
    });
  });
  protected readonly columns = ['email', 'name', 'role', 'status', 'createdAt', 'expiresAt'];
  protected readonly roles = ROLES;
  protected readonly roleLabels = ROLE_LABELS;
  protected readonly serverError = serverError;
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);
  protected readonly sentTo = signal<string | null>(null);

  protected readonly form = inject(FormBuilder).nonNullable.group({
    email: ['', [Validators.required, Validators.email]],
    name: ['', Validators.maxLength(120)],
    role: ['engineer' as Role, Validators.required],
  });

  protected sendInvitation(formDirective: FormGroupDirective): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.failure.set(null);
    this.sentTo.set(null);
    const { email, name, role } = this.form.getRawValue();
    const body = { email: email.trim(), role, ...(name.trim() ? { name: name.trim() } : {}) };
    this.http
      .post<{ invitation: Invitation }>('/api/invitations', body, { context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) })
      .subscribe({
        next: ({ invitation }) => {
          this.busy.set(false);
          this.sentTo.set(invitation.email);
          formDirective.resetForm({ email: '', name: '', role });
          this.invitations.reload();
        },
        error: (error: unknown) => {
          this.busy.set(false);
          if (!(error instanceof ApiError)) this.failure.set('The invitation could not be sent. Try again.');
          else if (!showServerErrors(this.form, error)) this.failure.set(error.message);
        },
      });
  }
}
