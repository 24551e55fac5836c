import Database from 'better-sqlite3';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, statSync, unlinkSync } from 'node:fs';
import path from 'node:path';
import * as tar from 'tar';
import {
  DB_FILE,
  MANIFEST_FILE,
  OpsError,
  integrityCheck,
  knownMigrations,
  listFiles,
  manifestSchema,
  sha256File,
  tableCounts,
  type Manifest,
} from './backup-format.js';
import type { PhaseReporter } from './backup.js';

/**
 * Restores a backup archive into an EMPTY (or not yet existing) DATA_DIR. Nothing is written to the
 * target until the whole archive has been unpacked beside it and checked: manifest, every SHA-256,
 * no unlisted files, PRAGMA integrity_check and the row count of every table. Only then are the
 * files moved in (a rename on the same file system), so a failed restore leaves the target as it was.
 */
export async function restoreBackup(archiveFile: string, dataDir: string, report: PhaseReporter = () => {}): Promise<Manifest> {
  const archive = path.resolve(archiveFile);
  if (!existsSync(archive) || !statSync(archive).isFile()) throw new OpsError(`The backup file ${archive} does not exist`);
  const target = path.resolve(dataDir);
  refuseNonEmpty(target);
  const parent = path.dirname(target);
  mkdirSync(parent, { recursive: true });

  const staging = mkdtempSync(path.join(parent, '.specimetry-restore-'));
  try {
    report('unpack', 0, 1);
    try {
      // strict: any tar warning (bad header, path outside the folder, ...) becomes an error.
      await tar.extract({ file: archive, cwd: staging, strict: true });
    } catch (err) {
      // A truncated, non-gzip or non-tar file is expected to fail here: say so in plain words.
      throw new OpsError(`${archive} is not a readable Specimetry backup (tar.gz): ${err instanceof Error ? err.message : String(err)}`);
    }
    report('unpack', 1, 1);

    const manifest = readManifest(staging);
    await verifyFiles(staging, manifest, report);
    verifyDatabase(path.join(staging, DB_FILE), manifest);

    unlinkSync(path.join(staging, MANIFEST_FILE));
    report('move', 0, 1);
    if (!existsSync(target)) {
      renameSync(staging, target);
    } else {
      refuseNonEmpty(target); // checked again: something may have appeared while we verified
      for (const name of readdirSync(staging)) renameSync(path.join(staging, name), path.join(target, name));
    }
    report('move', 1, 1);
    return manifest;
  } finally {
    rmSync(staging, { recursive: true, force: true });
  }
}

function refuseNonEmpty(target: string): void {
  if (!existsSync(target)) return;
  if (!statSync(target).isDirectory()) throw new OpsError(`DATA_DIR ${target} exists and is not a folder`);
  const present = readdirSync(target);
  if (present.length > 0) {
    const shown = present.slice(0, 5).join(', ') + (present.length > 5 ? `, … (${present.length} entries)` : '');
    throw new OpsError(
      `Refusing to restore into ${target}: the folder is not empty (it contains ${shown}). ` +
        'Restore only goes into an empty DATA_DIR, so that no existing data can be overwritten; choose a new folder or move the old one away first.',
    );
  }
}

function readManifest(staging: string): Manifest {
  const file = path.join(staging, MANIFEST_FILE);
  if (!existsSync(file)) throw new OpsError(`The archive has no ${MANIFEST_FILE}: it is not a Specimetry backup`);
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(file, 'utf8'));
  } catch {
    // A damaged manifest is expected to fail JSON parsing; report it as such.
    throw new OpsError(`${MANIFEST_FILE} in the archive is not valid JSON`);
  }
  const parsed = manifestSchema.safeParse(raw);
  if (!parsed.success) {
    throw new OpsError(`${MANIFEST_FILE} is not a Specimetry backup manifest of a known version: ${parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`);
  }
  const known = knownMigrations();
  if (parsed.data.migrations.applied > known.length) {
    throw new OpsError(
      `The backup is at database migration ${parsed.data.migrations.latest} (${parsed.data.migrations.applied}), newer than this version of Specimetry knows (${known.length}); restore it with Specimetry ${parsed.data.appVersion} or later`,
    );
  }
  return parsed.data;
}

async function verifyFiles(staging: string, manifest: Manifest, report: PhaseReporter): Promise<void> {
  const expected = [manifest.database, ...manifest.attachments];
  const listed = new Set([MANIFEST_FILE, ...expected.map((f) => f.path)]);
  const unlisted = listFiles(staging, staging).filter((f) => !listed.has(f));
  if (unlisted.length) throw new OpsError(`The archive holds files its manifest does not list: ${unlisted.slice(0, 5).join(', ')}`);
  for (const [i, entry] of expected.entries()) {
    const full = path.join(staging, entry.path);
    if (!existsSync(full)) throw new OpsError(`The archive is missing ${entry.path}, which its manifest lists`);
    const sum = await sha256File(full);
    if (sum !== entry.sha256) throw new OpsError(`Checksum mismatch for ${entry.path}: the manifest says ${entry.sha256}, the file has ${sum}`);
    report('verify', i + 1, expected.length);
  }
}

function verifyDatabase(file: string, manifest: Manifest): void {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const integrity = integrityCheck(db);
    if (integrity !== 'ok') throw new OpsError(`The database in the archive failed PRAGMA integrity_check: ${integrity}`);
    const counts = tableCounts(db);
    for (const [table, n] of Object.entries(manifest.tables)) {
      if (counts[table] !== n) throw new OpsError(`Table ${table} has ${counts[table] ?? 'no'} rows in the archive, the manifest says ${n}`);
    }
  } finally {
    db.close();
  }
}
