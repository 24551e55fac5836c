import type { Db } from './client.js';

/**
 * A query prepared once per database handle and reused. For the lookups every request makes
 * (session, user, study membership): preparing a statement costs more than running it, and drizzle
 * builds and prepares its SQL afresh on every plain `.get()`. Keyed by the handle, so a test's or a
 * restored database gets its own statements.
 */
export function preparedFor<T>(build: (db: Db) => T): (db: Db) => T {
  const cache = new WeakMap<Db, T>();
  return (db) => {
    let q = cache.get(db);
    if (q === undefined) {
      q = build(db);
      cache.set(db, q);
    }
    return q;
  };
}
