import { HttpClient } from '@angular/common/http';
import { DestroyRef, Injectable, computed, effect, inject, signal } from '@angular/core';
import { Observable, map, tap } from 'rxjs';
import type { NotificationItem } from '../../../shared/analysis';
import { AuthStore } from '../auth/auth-store';

/** How often the bell asks for news. A minute is soon enough for review work and cheap for the server. */
const POLL_MS = 60_000;

/** The signed-in user's notifications, shared by the top-bar bell and the notifications page. */
@Injectable({ providedIn: 'root' })
export class NotificationsStore {
  private readonly http = inject(HttpClient);
  private readonly auth = inject(AuthStore);
  private readonly items = signal<NotificationItem[]>([]);
  private readonly unreadCount = signal(0);

  readonly notifications = this.items.asReadonly();
  readonly unread = this.unreadCount.asReadonly();
  readonly hasUnread = computed(() => this.unreadCount() > 0);

  constructor() {
    const timer = setInterval(() => this.refresh(), POLL_MS);
    inject(DestroyRef).onDestroy(() => clearInterval(timer));
    // Signing in (or switching user) loads that user's list; signing out clears it.
    effect(() => {
      if (this.auth.user()) this.refresh();
      else {
        this.items.set([]);
        this.unreadCount.set(0);
      }
    });
  }

  refresh(): void {
    if (!this.auth.user()) return;
    this.http.get<{ notifications: NotificationItem[]; unread: number }>('/api/notifications').subscribe((r) => {
      this.items.set(r.notifications);
      this.unreadCount.set(r.unread);
    });
  }

  markRead(id: number): Observable<void> {
    return this.http.post<{ notification: NotificationItem }>(`/api/notifications/${id}/read`, null).pipe(
      tap(({ notification }) => {
        this.items.update((list) => list.map((n) => (n.id === id ? notification : n)));
        this.unreadCount.set(this.items().filter((n) => n.readAt === null).length);
      }),
      map(() => undefined),
    );
  }

  markAllRead(): Observable<void> {
    return this.http.post<{ updated: number }>('/api/notifications/read-all', null).pipe(
      tap(() => this.refresh()),
      map(() => undefined),
    );
  }
}
