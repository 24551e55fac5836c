import type Database from 'better-sqlite3';
import type { Db } from '../db/client.js';

// Prepared once per connection: this runs on every cached request, where preparing the statement
// would cost more than the lookup itself.
const statements = new WeakMap<Database.Database, Database.Statement<[number], number>>();

function revisionStatement(db: Db): Database.Statement<[number], number> {
  let stmt = statements.get(db.$client);
  if (!stmt) {
    stmt = db.$client.prepare<[number], number>('select revision from study_revisions where study_id = ?').pluck();
    statements.set(db.$client, stmt);
  }
  return stmt;
}

/**
 * The data revision of a study (table study_revisions, kept up by the triggers of
 * drizzle/0002_study-revisions.sql on every table holding the study's data).
 *
 * null when the study has no revision row (it does not exist, or the database predates the
 * migration's back-fill): callers then compute afresh and cache nothing, because a missing row
 * would never move on and a cache keyed by it could go stale.
 */
export function studyRevision(db: Db, studyId: number): number | null {
  return revisionStatement(db).get(studyId) ?? null;
}

/**
 * Runs `read` and reads the revision inside one SQLite read transaction, so both come from the same
 * snapshot (WAL): a write committed by another connection in between cannot make fresh data carry
 * an old revision, or old data a new one. Synchronous `read` only.
 */
export function readAtRevision<T>(db: Db, studyId: number, read: () => T): { revision: number | null; value: T } {
  return db.$client.transaction(() => {
    const revision = studyRevision(db, studyId);
    return { revision, value: read() };
  })();
}
