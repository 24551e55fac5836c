import { DatePipe } from '@angular/common';
import { HttpClient, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { MatTooltipModule } from '@angular/material/tooltip';
import { RouterLink } from '@angular/router';
import type { PublicUser } from '../../../shared/auth';
import { ROLES, ROLE_LABELS, type Role } from '../../../shared/roles';
import { AuthStore } from '../auth/auth-store';
import { Notifier } from '../core/notifier';

export interface AdminUser extends PublicUser {
  createdAt: string;
}

type UserPatch = Partial<Pick<AdminUser, 'role' | 'active' | 'name'>>;

/** Administrators: everyone's role, and who may still sign in. */
@Component({
  selector: 'sm-users',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, MatSelectModule, MatTableModule, MatTooltipModule],
  templateUrl: './users.html',
  styleUrl: './admin.scss',
})
export class Users {
  private readonly http = inject(HttpClient);
  private readonly notifier = inject(Notifier);
  private readonly me = inject(AuthStore).user;

  protected readonly users = httpResource<{ users: AdminUser[] }>(() => '/api/users');
  protected readonly rows = computed(() => (this.users.hasValue() ? this.users.value().users : []));
  protected readonly roles = ROLES;
  protected readonly roleLabels = ROLE_LABELS;
  protected readonly columns = ['name', 'email', 'role', 'status', 'createdAt', 'actions'];
  /** Rows with a change on its way to the server, disabled meanwhile. */
  protected readonly saving = signal<ReadonlySet<number>>(new Set());

  protected isMe(user: AdminUser): boolean {
    return user.id === this.me()?.id;
  }

  protected changeRole(user: AdminUser, role: Role): void {
    if (role === user.role) return;
    this.patch(user, { role }, (u) => `${u.name} is now ${ROLE_LABELS[u.role]}.`);
  }

  protected setActive(user: AdminUser, active: boolean): void {
    this.patch(user, { active }, (u) =>
      u.active ? `${u.name} can sign in again.` : `${u.name} was deactivated and signed out everywhere.`,
    );
  }

  private patch(user: AdminUser, change: UserPatch, confirmation: (u: AdminUser) => string): void {
    this.mark(user.id, true);
    this.http.patch<{ user: PublicUser }>(`/api/users/${user.id}`, change).subscribe({
      next: ({ user: updated }) => {
        this.mark(user.id, false);
        const merged: AdminUser = { ...user, ...updated };
        this.users.update((v) => v && { users: v.users.map((u) => (u.id === merged.id ? merged : u)) });
        this.notifier.info(confirmation(merged));
      },
      // The interceptor has shown the server's reason; reload so the row shows what is really stored.
      error: () => {
        this.mark(user.id, false);
        this.users.reload();
      },
    });
  }

  private mark(id: number, busy: boolean): void {
    const next = new Set(this.saving());
    if (busy) next.add(id);
    else next.delete(id);
    this.saving.set(next);
  }
}
