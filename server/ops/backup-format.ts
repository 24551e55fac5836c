import Database from 'better-sqlite3';
import { createHash } from 'node:crypto';
import { createReadStream, existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { MIGRATIONS_DIR } from '../db/client.js';

/**
 * The backup archive is a gzip-compressed POSIX tar (written and read with node-tar) holding:
 *   manifest.json        — this schema: format, version, what was backed up, SHA-256 of every file;
 *   specimetry.db        — a consistent snapshot made with SQLite's online backup API;
 *   attachments/...      — a copy of DATA_DIR/attachments, paths kept.
 * Any tar tool can list or unpack it (`tar -tzf backup.tar.gz`); restore checks every checksum first.
 * The session secret is deliberately left out: after a restore everybody signs in again.
 */
export const BACKUP_FORMAT = 'specimetry-backup';
export const BACKUP_FORMAT_VERSION = 1;
export const DB_FILE = 'specimetry.db';
export const MANIFEST_FILE = 'manifest.json';
export const ATTACHMENTS_DIR = 'attachments';

const fileEntry = z.object({ path: z.string().min(1), sha256: z.string().regex(/^[0-9a-f]{64}$/), bytes: z.number().int().nonnegative() });
export type FileEntry = z.infer<typeof fileEntry>;

export const manifestSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  formatVersion: z.literal(BACKUP_FORMAT_VERSION),
  createdAt: z.string(),
  appVersion: z.string(),
  migrations: z.object({ applied: z.number().int().nonnegative(), latest: z.string() }),
  database: fileEntry,
  /** Row count per table at the moment of the snapshot, checked again after restore. */
  tables: z.record(z.string(), z.number().int().nonnegative()),
  attachments: z.array(fileEntry),
});
export type Manifest = z.infer<typeof manifestSchema>;

/** Thrown for every expected refusal (bad archive, non-empty target, ...); the CLI prints the message. */
export class OpsError extends Error {
  override readonly name = 'OpsError';
}

export async function sha256File(file: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(file)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

/** Every regular file below `root`, as forward-slash paths relative to `base`. */
export function listFiles(root: string, base: string): string[] {
  if (!existsSync(root)) return [];
  const out: string[] = [];
  for (const entry of readdirSync(root, { withFileTypes: true })) {
    const full = path.join(root, entry.name);
    if (entry.isDirectory()) out.push(...listFiles(full, base));
    else if (entry.isFile()) out.push(path.relative(base, full).split(path.sep).join('/'));
  }
  return out.sort();
}

export async function describeFile(base: string, rel: string): Promise<FileEntry> {
  const full = path.join(base, rel);
  return { path: rel, sha256: await sha256File(full), bytes: statSync(full).size };
}

/** Row counts of every user table (SQLite's own and Drizzle's bookkeeping included: both must survive). */
export function tableCounts(db: Database.Database): Record<string, number> {
  const names = db.prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name").all() as { name: string }[];
  const out: Record<string, number> = {};
  for (const { name } of names) out[name] = (db.prepare(`select count(*) as n from "${name.replaceAll('"', '""')}"`).get() as { n: number }).n;
  return out;
}

export function integrityCheck(db: Database.Database): string {
  const rows = db.pragma('integrity_check') as { integrity_check: string }[];
  return rows.map((r) => r.integrity_check).join('; ');
}

export function migrationsApplied(db: Database.Database): { applied: number; latest: string } {
  const entries = knownMigrations();
  const hasTable = db.prepare("select 1 from sqlite_master where name = '__drizzle_migrations'").get();
  const applied = hasTable ? (db.prepare('select count(*) as n from __drizzle_migrations').get() as { n: number }).n : 0;
  return { applied, latest: entries[applied - 1] ?? 'none' };
}

/** Migration tags this version of the code knows, oldest first. */
export function knownMigrations(): string[] {
  const journal = JSON.parse(readFileSync(path.join(MIGRATIONS_DIR, 'meta/_journal.json'), 'utf8')) as { entries: { tag: string }[] };
  return journal.entries.map((e) => e.tag);
}
