import { eq, lt } from 'drizzle-orm';
import session from 'express-session';
import type { Db } from '../db/client.js';
import { sessions } from '../db/schema.js';

type SessionData = session.SessionData & { passport?: { user?: number } };
type Callback = (err?: unknown, data?: session.SessionData | null) => void;

const DAY_MS = 24 * 60 * 60 * 1000;

/**
 * express-session store over the app's own Drizzle table (STACK.md pitfall 8). The user id is kept
 * in its own column so that deactivating a user can end all of that user's sessions at once.
 * Expired rows are removed lazily on read and by `prune()`, which the server calls hourly.
 */
export class DrizzleSessionStore extends session.Store {
  constructor(private readonly db: Db) {
    super();
  }

  override get(sid: string, cb: Callback): void {
    const row = this.db.select().from(sessions).where(eq(sessions.sid, sid)).get();
    if (!row) return cb(null, null);
    if (row.expiresAt <= Date.now()) {
      this.db.delete(sessions).where(eq(sessions.sid, sid)).run();
      return cb(null, null);
    }
    cb(null, JSON.parse(row.data) as session.SessionData);
  }

  override set(sid: string, data: session.SessionData, cb?: (err?: unknown) => void): void {
    const expiresAt = expiryOf(data);
    const userId = (data as SessionData).passport?.user ?? null;
    const json = JSON.stringify(data);
    this.db
      .insert(sessions)
      .values({ sid, data: json, expiresAt, userId })
      .onConflictDoUpdate({ target: sessions.sid, set: { data: json, expiresAt, userId } })
      .run();
    cb?.();
  }

  override destroy(sid: string, cb?: (err?: unknown) => void): void {
    this.db.delete(sessions).where(eq(sessions.sid, sid)).run();
    cb?.();
  }

  override touch(sid: string, data: session.SessionData, cb?: (err?: unknown) => void): void {
    this.db.update(sessions).set({ expiresAt: expiryOf(data) }).where(eq(sessions.sid, sid)).run();
    cb?.();
  }

  destroyForUser(userId: number): void {
    this.db.delete(sessions).where(eq(sessions.userId, userId)).run();
  }

  prune(): void {
    this.db.delete(sessions).where(lt(sessions.expiresAt, Date.now())).run();
  }
}

function expiryOf(data: session.SessionData): number {
  const expires = data.cookie?.expires;
  return expires ? new Date(expires).getTime() : Date.now() + DAY_MS;
}
