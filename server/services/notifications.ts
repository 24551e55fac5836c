import { and, desc, eq, isNull, sql } from 'drizzle-orm';
import type { NotificationItem } from '../../shared/analysis.js';
import type { Db } from '../db/client.js';
import { notifications } from '../db/schema.js';
import { notFound } from '../http-error.js';
import type { DbOrTx } from './audit.js';

/**
 * In-app notifications: a short message and a client route per event that asks someone to act
 * (a review request, a comment on their analysis, a sign-off or a return). Mail is sent only for
 * review requests; everything else waits in the app.
 */

export type NotificationKind = 'review-request' | 'comment' | 'reply' | 'approved' | 'returned';

export function notify(tx: DbOrTx, userIds: Iterable<number>, kind: NotificationKind, message: string, link: string): void {
  const unique = [...new Set(userIds)];
  if (unique.length) tx.insert(notifications).values(unique.map((userId) => ({ userId, kind, message, link }))).run();
}

const columns = {
  id: notifications.id,
  kind: notifications.kind,
  message: notifications.message,
  link: notifications.link,
  readAt: notifications.readAt,
  createdAt: notifications.createdAt,
};

export function listNotifications(db: Db, userId: number, unreadOnly: boolean): { notifications: NotificationItem[]; unread: number } {
  const items = db
    .select(columns)
    .from(notifications)
    .where(and(eq(notifications.userId, userId), unreadOnly ? isNull(notifications.readAt) : undefined))
    .orderBy(desc(notifications.createdAt), desc(notifications.id))
    .limit(100)
    .all();
  const unread = db.select({ n: sql<number>`count(*)` }).from(notifications).where(and(eq(notifications.userId, userId), isNull(notifications.readAt))).get()!.n;
  return { notifications: items, unread };
}

/** Marks one of the caller's own notifications read; someone else's is "not found". */
export function markRead(db: Db, userId: number, id: number): NotificationItem {
  const row = db.select(columns).from(notifications).where(and(eq(notifications.id, id), eq(notifications.userId, userId))).get();
  if (!row) throw notFound(`Notification ${id}`);
  if (row.readAt !== null) return row;
  const readAt = Date.now();
  db.update(notifications).set({ readAt }).where(eq(notifications.id, id)).run();
  return { ...row, readAt };
}

export function markAllRead(db: Db, userId: number): number {
  return db.update(notifications).set({ readAt: Date.now() }).where(and(eq(notifications.userId, userId), isNull(notifications.readAt))).run().changes;
}
