import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Router } from '@angular/router';
import type { NotificationItem } from '../../../shared/analysis';
import { formatWhen } from '../analysis/format';
import { notificationIcon } from './notification-kinds';
import { NotificationsStore } from './notifications-store';

/** All notifications of the signed-in user, newest first; each links to the analysis it is about. */
@Component({
  selector: 'sm-notifications-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatIconModule],
  template: `
    <section class="sm-page">
      <div class="heading">
        <h1 class="sm-page-title">Notifications</h1>
        <span class="spacer"></span>
        <button mat-stroked-button (click)="markAllRead()" [disabled]="!store.hasUnread()"><mat-icon>done_all</mat-icon>Mark all read</button>
      </div>
      <p class="sm-page-lead">Review requests, comments and sign-offs on the analyses you work on.</p>
      <ul class="list">
        @for (n of store.notifications(); track n.id) {
          <li class="sm-panel" [class.unread]="n.readAt === null" [attr.data-notification]="n.kind">
            <mat-icon>{{ icon(n.kind) }}</mat-icon>
            <div class="body">
              <div class="message">
                @if (n.readAt === null) {
                  <span class="new">New</span>
                }
                {{ n.message }}
              </div>
              <div class="when">{{ when(n.createdAt) }}</div>
            </div>
            @if (n.link) {
              <button mat-button (click)="open(n)">Open<mat-icon iconPositionEnd>arrow_forward</mat-icon></button>
            }
          </li>
        } @empty {
          <li class="none">No notifications.</li>
        }
      </ul>
    </section>
  `,
  styles: `
    .heading {
      display: flex;
      align-items: center;
    }
    .spacer {
      flex: 1;
    }
    .list {
      list-style: none;
      padding: 0;
      margin: 0;
      display: grid;
      gap: 8px;
    }
    li.sm-panel {
      display: flex;
      align-items: center;
      gap: 14px;
      padding: 12px 16px;
    }
    li.unread {
      border-left: 4px solid var(--sm-accent);
      font-weight: 500;
    }
    .body {
      flex: 1;
    }
    .new {
      font: var(--mat-sys-label-small);
      text-transform: uppercase;
      background: var(--sm-accent-container);
      color: var(--sm-on-accent-container);
      border-radius: 4px;
      padding: 1px 6px;
      margin-right: 6px;
    }
    .when {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class NotificationsPage {
  protected readonly store = inject(NotificationsStore);
  private readonly router = inject(Router);
  protected readonly icon = notificationIcon;
  protected readonly when = formatWhen;

  constructor() {
    this.store.refresh();
  }

  protected open(n: NotificationItem): void {
    const go = () => void this.router.navigateByUrl(n.link ?? '/notifications');
    if (n.readAt === null) this.store.markRead(n.id).subscribe({ next: go, error: go });
    else go();
  }

  protected markAllRead(): void {
    this.store.markAllRead().subscribe();
  }
}
