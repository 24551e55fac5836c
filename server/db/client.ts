import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import * as schema from './schema.js';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

export const MIGRATIONS_DIR = path.resolve(import.meta.dirname, '../../drizzle');

/**
 * Opens (or creates) the SQLite file, switches on WAL and foreign keys, and applies every pending
 * migration from drizzle/. WAL lets readers (run-sheet GETs) proceed while one writer commits.
 */
export function openDatabase(file: string): Db {
  const sqlite = new Database(file);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('busy_timeout = 5000');
  sqlite.pragma('synchronous = NORMAL');
  const db = drizzle(sqlite, { schema }) as Db;
  migrate(db, { migrationsFolder: MIGRATIONS_DIR });
  return db;
}

/** The tag of the newest migration applied, for /api/health. */
export function migrationLevel(db: Db): { applied: number; latest: string } {
  const journal = JSON.parse(readFileSync(path.join(MIGRATIONS_DIR, 'meta/_journal.json'), 'utf8')) as {
    entries: { tag: string }[];
  };
  const row = db.$client.prepare('select count(*) as n from __drizzle_migrations').get() as { n: number };
  return { applied: row.n, latest: journal.entries[row.n - 1]?.tag ?? 'none' };
}
