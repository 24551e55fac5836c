import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatBadgeModule } from '@angular/material/badge';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Router, RouterLink } from '@angular/router';
import type { NotificationItem } from '../../../shared/analysis';
import { formatWhen } from '../analysis/format';
import { NotificationsStore } from './notifications-store';
import { notificationIcon } from './notification-kinds';

/** The top-bar bell: unread count, the latest few notifications, and a link to all of them. */
@Component({
  selector: 'sm-notification-bell',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatBadgeModule, MatButtonModule, MatIconModule, MatMenuModule, MatTooltipModule, RouterLink],
  template: `
    <button
      mat-icon-button
      [matMenuTriggerFor]="menu"
      (menuOpened)="store.refresh()"
      [attr.aria-label]="label()"
      matTooltip="Notifications"
      data-testid="notification-bell"
    >
      <mat-icon [matBadge]="badge()" [matBadgeHidden]="!store.hasUnread()" matBadgeSize="small" matBadgeColor="warn">{{
        store.hasUnread() ? 'notifications_active' : 'notifications'
      }}</mat-icon>
    </button>
    <mat-menu #menu="matMenu" xPosition="before" class="sm-notification-menu">
      @for (n of latest(); track n.id) {
        <button mat-menu-item (click)="open(n)" [class.unread]="n.readAt === null" [attr.data-notification]="n.kind">
          <mat-icon>{{ icon(n.kind) }}</mat-icon>
          <span>
            @if (n.readAt === null) {
              <b>{{ n.message }}</b>
            } @else {
              {{ n.message }}
            }
            <br /><small>{{ when(n.createdAt) }}</small>
          </span>
        </button>
      } @empty {
        <p class="none">Nothing new.</p>
      }
      <a mat-menu-item routerLink="/notifications"><mat-icon>list</mat-icon>All notifications</a>
    </mat-menu>
  `,
  styles: `
    .none {
      padding: 8px 16px;
      margin: 0;
    }
  `,
})
export class NotificationBell {
  protected readonly store = inject(NotificationsStore);
  private readonly router = inject(Router);
  protected readonly latest = computed(() => this.store.notifications().slice(0, 6));
  protected readonly badge = computed(() => (this.store.unread() > 99 ? '99+' : String(this.store.unread())));
  protected readonly label = computed(() => (this.store.hasUnread() ? `Notifications, ${this.store.unread()} unread` : 'Notifications'));
  protected readonly icon = notificationIcon;
  protected readonly when = formatWhen;

  protected open(n: NotificationItem): void {
    const go = () => (n.link ? void this.router.navigateByUrl(n.link) : void this.router.navigate(['/notifications']));
    if (n.readAt === null) this.store.markRead(n.id).subscribe({ next: go, error: go });
    else go();
  }
}
