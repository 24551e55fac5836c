import { eq, lt, sql } from 'drizzle-orm';
import session from 'express-session';
import type { Db } from '../db/client.js';
import { preparedFor } from '../db/prepared.js';
import { sessions } from '../db/schema.js';

type SessionData = session.SessionData & { passport?: { user?: number } };
type Callback = (err?: unknown, data?: session.SessionData | null) => void;

const DAY_MS = 24 * 60 * 60 * 1000;

/**
 * A touch (express-session calls it on every request of a rolling session) writes the new expiry
 * only when it moved by more than this: one write a minute per active session instead of one per
 * request, so an idle session may end up to a minute early.
 */
export const TOUCH_WRITE_INTERVAL_MS = 60_000;

const readSession = preparedFor((db) => db.select().from(sessions).where(eq(sessions.sid, sql.placeholder('sid'))).prepare());
const writeExpiry = preparedFor((db) =>
  db.update(sessions).set({ expiresAt: sql`${sql.placeholder('expiresAt')}` }).where(eq(sessions.sid, sql.placeholder('sid'))).prepare(),
);

/**
 * express-session store over the app's own Drizzle table (STACK.md pitfall 8). The user id is kept
 * in its own column so that deactivating a user can end all of that user's sessions at once.
 * Expired rows are removed lazily on read and by `prune()`, which the server calls hourly.
 */
export class DrizzleSessionStore extends session.Store {
  /** The expiry last stored per session id, as far as this process knows (for throttling touch). */
  private readonly storedExpiry = new Map<string, number>();

  constructor(private readonly db: Db) {
    super();
  }

  override get(sid: string, cb: Callback): void {
    const row = readSession(this.db).get({ sid });
    if (!row) return cb(null, null);
    if (row.expiresAt <= Date.now()) {
      this.db.delete(sessions).where(eq(sessions.sid, sid)).run();
      this.storedExpiry.delete(sid);
      return cb(null, null);
    }
    this.storedExpiry.set(sid, row.expiresAt);
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
    this.storedExpiry.set(sid, expiresAt);
    cb?.();
  }

  override destroy(sid: string, cb?: (err?: unknown) => void): void {
    this.db.delete(sessions).where(eq(sessions.sid, sid)).run();
    this.storedExpiry.delete(sid);
    cb?.();
  }

  override touch(sid: string, data: session.SessionData, cb?: (err?: unknown) => void): void {
    const expiresAt = expiryOf(data);
    const stored = this.storedExpiry.get(sid);
    if (stored === undefined || Math.abs(expiresAt - stored) > TOUCH_WRITE_INTERVAL_MS) {
      writeExpiry(this.db).run({ sid, expiresAt });
      this.storedExpiry.set(sid, expiresAt);
    }
    cb?.();
  }

  destroyForUser(userId: number): void {
    this.db.delete(sessions).where(eq(sessions.userId, userId)).run();
    // the rows are gone; a later touch of one of them writes nothing (UPDATE of no row)
    this.storedExpiry.clear();
  }

  prune(): void {
    this.db.delete(sessions).where(lt(sessions.expiresAt, Date.now())).run();
    this.storedExpiry.clear();
  }
}

function expiryOf(data: session.SessionData): number {
  const expires = data.cookie?.expires;
  return expires ? new Date(expires).getTime() : Date.now() + DAY_MS;
}
