import Database from 'better-sqlite3';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import * as tar from 'tar';
import { VERSION } from '../bootstrap.js';
import {
  ATTACHMENTS_DIR,
  BACKUP_FORMAT,
  BACKUP_FORMAT_VERSION,
  DB_FILE,
  MANIFEST_FILE,
  OpsError,
  describeFile,
  integrityCheck,
  listFiles,
  migrationsApplied,
  tableCounts,
  type Manifest,
} from './backup-format.js';

export interface BackupResult {
  file: string;
  manifest: Manifest;
}

export type PhaseReporter = (phase: string, done: number, total: number) => void;

/**
 * Online backup of a (possibly running) instance: the database through SQLite's backup API, then
 * the attachments folder, into one tar.gz (see backup-format.ts). Safe while the server writes:
 * the snapshot is copied in a single backup step, which holds one read transaction for its whole
 * duration, so it never mixes pages from before and after a concurrent commit (WAL lets the
 * server keep writing meanwhile). Attachment files are written before their database rows, so
 * every attachment the snapshot refers to is already on disk when the folder is copied.
 */
export async function createBackup(dataDir: string, archiveFile: string, report: PhaseReporter = () => {}): Promise<BackupResult> {
  const source = path.join(dataDir, DB_FILE);
  if (!existsSync(source)) throw new OpsError(`No database at ${source}: is DATA_DIR (${dataDir}) right?`);
  const target = path.resolve(archiveFile);
  if (!existsSync(path.dirname(target))) throw new OpsError(`The folder for the backup file does not exist: ${path.dirname(target)}`);
  if (existsSync(target)) throw new OpsError(`${target} already exists; choose a new file name (backups are never overwritten)`);

  const staging = mkdtempSync(path.join(path.dirname(target), '.specimetry-backup-'));
  try {
    report('database', 0, 1);
    const snapshotFile = path.join(staging, DB_FILE);
    const live = new Database(source, { fileMustExist: true });
    try {
      live.pragma('busy_timeout = 5000');
      // Return the largest page count after the first step: the rest goes in one step (see above).
      await live.backup(snapshotFile, { progress: () => 0x7fffffff });
    } finally {
      live.close();
    }
    const snap = new Database(snapshotFile);
    let tables: Record<string, number>;
    let migrations: { applied: number; latest: string };
    try {
      // A standalone file: fold any WAL content in and leave rollback-journal mode for portability.
      snap.pragma('journal_mode = DELETE');
      const integrity = integrityCheck(snap);
      if (integrity !== 'ok') throw new OpsError(`The database snapshot failed PRAGMA integrity_check: ${integrity}`);
      tables = tableCounts(snap);
      migrations = migrationsApplied(snap);
    } finally {
      snap.close();
    }
    report('database', 1, 1);

    const attachmentFiles = listFiles(path.join(dataDir, ATTACHMENTS_DIR), dataDir);
    const attachments = [];
    for (const [i, rel] of attachmentFiles.entries()) {
      const dest = path.join(staging, rel);
      mkdirSync(path.dirname(dest), { recursive: true });
      copyFileSync(path.join(dataDir, rel), dest);
      // Checksum the copy, not the original: the copy is what goes into the archive.
      attachments.push(await describeFile(staging, rel));
      report('attachments', i + 1, attachmentFiles.length);
    }

    const manifest: Manifest = {
      format: BACKUP_FORMAT,
      formatVersion: BACKUP_FORMAT_VERSION,
      createdAt: new Date().toISOString(),
      appVersion: VERSION,
      migrations,
      database: await describeFile(staging, DB_FILE),
      tables,
      attachments,
    };
    writeFileSync(path.join(staging, MANIFEST_FILE), JSON.stringify(manifest, null, 2));

    report('archive', 0, 1);
    const partial = `${target}.partial`;
    const entries = [MANIFEST_FILE, DB_FILE, ...(attachments.length ? [ATTACHMENTS_DIR] : [])];
    await tar.create({ gzip: true, file: partial, cwd: staging, portable: true }, entries);
    // Rename last, so a crash never leaves a file under the final name that looks complete.
    renameSync(partial, target);
    report('archive', 1, 1);
    return { file: target, manifest };
  } finally {
    rmSync(staging, { recursive: true, force: true });
  }
}
