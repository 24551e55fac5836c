import Database from 'better-sqlite3';
import { spawn } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import * as tar from 'tar';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createBackup } from '../../server/ops/backup.js';
import { restoreBackup } from '../../server/ops/restore.js';
import { OpsError, tableCounts } from '../../server/ops/backup-format.js';
import { signIn, startTestApp, type Client, type TestApp } from './harness.js';

// Backup and restore. What "consistent" means comes from SQLite's own documentation of the online
// backup API (sqlite.org/backup.html: the copy is a snapshot of one point in time) and of
// PRAGMA integrity_check (sqlite.org/pragma.html#pragma_integrity_check: the single row "ok").

const TSX = path.resolve('node_modules/.bin/tsx');
let t: TestApp;
let engineer: Client;
let work: string;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  work = mkdtempSync(path.join(tmpdir(), 'specimetry-backup-test-'));
  // Attachments as the studies module stores them: below DATA_DIR/attachments, binary content.
  for (let i = 0; i < 12; i++) {
    const dir = path.join(t.dataDir, 'attachments', String(1 + (i % 3)));
    mkdirSync(dir, { recursive: true });
    writeFileSync(path.join(dir, `file-${i}.bin`), randomBytes(1000 + i * 700));
  }
});
afterAll(async () => {
  await t.close();
  rmSync(work, { recursive: true, force: true });
});

function cli(script: 'backup' | 'restore', arg: string, dataDir: string): Promise<{ code: number | null; out: string }> {
  return new Promise((resolve) => {
    const child = spawn(TSX, [`server/cli/${script}.ts`, arg], { env: { ...process.env, DATA_DIR: dataDir }, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    child.stdout.on('data', (d: Buffer) => (out += d.toString()));
    child.stderr.on('data', (d: Buffer) => (out += d.toString()));
    child.on('close', (code) => resolve({ code, out }));
  });
}

function checksums(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const full = path.join(d, e.name);
      if (e.isDirectory()) walk(full);
      else out[path.relative(dir, full)] = createHash('sha256').update(readFileSync(full)).digest('hex');
    }
  };
  walk(dir);
  return out;
}

function openRestored(dataDir: string): Database.Database {
  return new Database(path.join(dataDir, 'specimetry.db'), { readonly: true });
}

/** One write through the API: a token is created (row + audit row in one transaction) and revoked. */
async function writeOnce(i: number): Promise<void> {
  const res = await engineer.post('/api/tokens', { name: `load ${i}`, scope: 'read', expiresInDays: 1 });
  expect(res.status).toBe(201);
  expect((await engineer.delete(`/api/tokens/${res.body.token.id}`)).status).toBe(200);
}

describe('npm run backup / npm run restore', () => {
  it('backs up while the server is writing, and restores an identical, intact copy', async () => {
    const file = path.join(work, 'online.tar.gz');
    let running = true;
    let writes = 0;
    const writer = (async () => {
      while (running) await writeOnce(writes++);
    })();
    const backup = cli('backup', file, t.dataDir);
    const result = await backup.finally(() => (running = false));
    await writer;
    expect(result.out).toContain('Backup written to');
    expect(result.code).toBe(0);
    // The test only proves something if the server really wrote while the backup ran.
    expect(writes).toBeGreaterThan(0);

    const target = path.join(work, 'restored-online');
    const restore = await cli('restore', file, target);
    expect(restore.out).toContain('Restored the backup');
    expect(restore.code).toBe(0);
    const db = openRestored(target);
    try {
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
      // A torn snapshot would split a transaction: every token must have its creation audit row.
      const tokens = (db.prepare('select count(*) as n from api_tokens').get() as { n: number }).n;
      const created = (db.prepare("select count(*) as n from audit_events where entity = 'api-token' and action = 'create'").get() as { n: number }).n;
      expect(created).toBe(tokens);
    } finally {
      db.close();
    }
    expect(checksums(path.join(target, 'attachments'))).toEqual(checksums(path.join(t.dataDir, 'attachments')));
    expect(existsSync(path.join(target, 'session-secret'))).toBe(false);
  });

  it('a backup taken at rest restores with the same row count in every table', async () => {
    const file = path.join(work, 'quiet.tar.gz');
    const { manifest } = await createBackup(t.dataDir, file);
    const live = tableCounts(t.ctx.db.$client);
    expect(manifest.tables).toEqual(live);
    expect(live['api_tokens']).toBeGreaterThan(0);
    const target = path.join(work, 'restored-quiet');
    await restoreBackup(file, target);
    const db = openRestored(target);
    try {
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
      expect(tableCounts(db)).toEqual(live);
    } finally {
      db.close();
    }
    expect(checksums(path.join(target, 'attachments'))).toEqual(checksums(path.join(t.dataDir, 'attachments')));
  });

  it('refuses to restore into a DATA_DIR that is not empty, and leaves it untouched', async () => {
    const file = path.join(work, 'refuse.tar.gz');
    await createBackup(t.dataDir, file);
    const target = path.join(work, 'occupied');
    mkdirSync(target);
    writeFileSync(path.join(target, 'notes.txt'), 'keep me');
    const res = await cli('restore', file, target);
    expect(res.code).toBe(2);
    expect(res.out).toContain('not empty');
    expect(res.out).toContain('notes.txt');
    expect(readdirSync(target)).toEqual(['notes.txt']);
  });

  it('refuses an archive whose files do not match their checksums, and writes nothing', async () => {
    const file = path.join(work, 'good.tar.gz');
    await createBackup(t.dataDir, file);
    const unpacked = path.join(work, 'tamper');
    mkdirSync(unpacked);
    await tar.extract({ file, cwd: unpacked });
    writeFileSync(path.join(unpacked, 'attachments', '1', 'file-0.bin'), 'changed after the backup');
    const bad = path.join(work, 'tampered.tar.gz');
    await tar.create({ gzip: true, file: bad, cwd: unpacked }, readdirSync(unpacked));
    const target = path.join(work, 'never-created');
    await expect(restoreBackup(bad, target)).rejects.toThrow(/Checksum mismatch for attachments\/1\/file-0\.bin/);
    expect(existsSync(target)).toBe(false);

    const junk = path.join(work, 'junk.tar.gz');
    writeFileSync(junk, 'this is not an archive');
    await expect(restoreBackup(junk, target)).rejects.toBeInstanceOf(OpsError);
    expect(existsSync(target)).toBe(false);
  });

  it('never overwrites an existing backup file', async () => {
    const file = path.join(work, 'once.tar.gz');
    await createBackup(t.dataDir, file);
    await expect(createBackup(t.dataDir, file)).rejects.toThrow(/already exists/);
  });
});
