import Database from 'better-sqlite3';
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import net from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pino from 'pino';
import { afterAll, describe, expect, it } from 'vitest';
import { createContext } from '../../server/bootstrap.js';
import { loadConfig } from '../../server/config.js';
import { DEMO_PASSWORD } from '../../server/services/seed.js';
import { csv } from './hardening-files.js';
import { seedStudy, type SeededStudy } from './hardening-study.js';

// Crash safety: SQLite's atomic commit (sqlite.org/atomiccommit.html, and WAL: sqlite.org/wal.html —
// "a transaction that has not committed when a crash happens is rolled back on the next open") must
// leave no partial import after the server process is killed without warning.

// node --import tsx, not the tsx launcher: the launcher runs the server in a child process, and a
// SIGKILL to the launcher would leave that child running.
const NODE_ARGS = ['--import', 'tsx', 'server/index.ts'];
const dataDir = mkdtempSync(path.join(tmpdir(), 'specimetry-crash-'));
const children: ChildProcess[] = [];
afterAll(() => {
  for (const c of children) if (c.exitCode === null) c.kill('SIGKILL');
  rmSync(dataDir, { recursive: true, force: true });
});

const BIG_FACTORS = [
  { name: 'Neck width ratio', symbol: 'W', unit: '', kind: 'numeric' as const, levels: ['0.4', '0.5', '0.6', '0.7', '0.8'].map((value) => ({ value })), tracksMeasured: false },
  { name: 'Notch angle', symbol: 'A', unit: 'deg', kind: 'numeric' as const, levels: ['30', '40', '50', '60', '70'].map((value) => ({ value })), tracksMeasured: false },
  { name: 'Root radius ratio', symbol: 'K', unit: '', kind: 'numeric' as const, levels: ['0.5', '1', '2', '4'].map((value) => ({ value })), tracksMeasured: false },
  { name: 'Orientation', symbol: 'O', unit: 'deg', kind: 'numeric' as const, levels: ['0', '22.5', '45', '67.5', '90'].map((value) => ({ value })), tracksMeasured: false },
];

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = net.createServer().listen(0, '127.0.0.1', () => {
      const port = (srv.address() as net.AddressInfo).port;
      srv.close(() => resolve(port));
    });
  });
}

async function startServer(port: number): Promise<ChildProcess> {
  const child = spawn(process.execPath, NODE_ARGS, { env: { ...process.env, DATA_DIR: dataDir, PORT: String(port), LOG_LEVEL: 'warn', DEMO: '1', MAX_UPLOAD_MB: '40' }, stdio: 'ignore' });
  children.push(child);
  for (let i = 0; i < 300; i++) {
    const ok = await fetch(`http://127.0.0.1:${port}/api/health`).then((r) => r.ok, () => false);
    if (ok) return child;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error('server did not start');
}

/** A cookie-and-XSRF session over real HTTP (the server runs in its own process). */
async function session(base: string) {
  let cookies = new Map<string, string>();
  const keep = (res: Response) => {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const i = pair!.indexOf('=');
      cookies.set(pair!.slice(0, i), pair!.slice(i + 1));
    }
    return res;
  };
  const headers = () => ({ cookie: [...cookies].map(([k, v]) => `${k}=${v}`).join('; '), 'x-xsrf-token': decodeURIComponent(cookies.get('XSRF-TOKEN') ?? '') });
  keep(await fetch(`${base}/api/config`));
  const login = keep(await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { ...headers(), 'content-type': 'application/json' }, body: JSON.stringify({ email: 'engineer@specimetry.test', password: DEMO_PASSWORD }) }));
  if (!login.ok) throw new Error(`sign-in failed: ${login.status}`);
  return {
    post: (url: string, body?: BodyInit) => fetch(`${base}${url}`, { method: 'POST', headers: headers(), body }).then(keep),
    reset: () => (cookies = new Map()),
  };
}

function valuesOf(db: Database.Database, studyId: number): number {
  return (db.prepare('select count(*) as n from run_values v join runs r on r.id = v.run_id where r.study_id = ?').get(studyId) as { n: number }).n;
}

describe('SIGKILL during a large import', () => {
  it('leaves zero partial rows and an intact database after restart', async () => {
    // Prepare a 50 000-run study in the data folder the server will use.
    const running = await createContext(loadConfig({ DATA_DIR: dataDir, LOG_LEVEL: 'silent' }), pino({ level: 'silent' }));
    let s: SeededStudy;
    try {
      s = seedStudy(running.ctx, { factors: BIG_FACTORS, replicates: 100 });
    } finally {
      await running.close();
    }
    expect(s.runs.length).toBe(50_000);
    const file = csv([['Run', 'H', 'r', 'Notes'], ...s.runs.map((r, i) => [r.code, (0.5 + (i % 97) / 100).toFixed(3), (1 + (i % 89) / 50).toFixed(3), `batch ${i % 7}`])]);

    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    let server = await startServer(port);
    const api = await session(base);
    const form = new FormData();
    form.set('file', new Blob([file], { type: 'text/csv' }), 'fe-batch.csv');
    const preview = await api.post(`/api/studies/${s.studyId}/imports`, form);
    expect(preview.status).toBe(201);
    const imp = ((await preview.json()) as { import: { id: number; errorCount: number; rowCount: number } }).import;
    expect(imp, JSON.stringify(imp).slice(0, 600)).toMatchObject({ errorCount: 0, rowCount: 50_000 });

    // Empty the WAL so that its growth shows the commit's transaction spilling pages, i.e. in flight.
    const wal = path.join(dataDir, 'specimetry.db-wal');
    const side = new Database(path.join(dataDir, 'specimetry.db'));
    side.pragma('wal_checkpoint(TRUNCATE)');
    side.close();
    const baseline = existsSync(wal) ? statSync(wal).size : 0;

    const commit = api.post(`/api/studies/${s.studyId}/imports/${imp.id}/commit`).then((r) => r.status, () => 'connection lost');
    let grown = 0;
    const deadline = Date.now() + 60_000;
    while (grown < 32_768 && Date.now() < deadline) {
      await new Promise((r) => setImmediate(r));
      grown = (existsSync(wal) ? statSync(wal).size : 0) - baseline;
    }
    expect(grown).toBeGreaterThanOrEqual(32_768);
    server.kill('SIGKILL');
    const exited = await new Promise<NodeJS.Signals | null>((resolve) => server.once('exit', (_c, sig) => resolve(sig)));
    expect(exited).toBe('SIGKILL');
    expect(await commit).toBe('connection lost');

    // Restart: SQLite rolls the unfinished transaction back when the database is opened again.
    server = await startServer(port);
    const db = new Database(path.join(dataDir, 'specimetry.db'), { readonly: true });
    try {
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
      expect(valuesOf(db, s.studyId)).toBe(0);
      const status = db.prepare('select status from imports where id = ?').get(imp.id) as { status: string };
      expect(status.status).toBe('preview');
      const audit = db.prepare("select count(*) as n from audit_events where study_id = ? and action = 'import'").get(s.studyId) as { n: number };
      expect(audit.n).toBe(0);
    } finally {
      db.close();
    }

    // The same import can be committed after the restart, completely.
    api.reset();
    const again = await session(base);
    const done = await again.post(`/api/studies/${s.studyId}/imports/${imp.id}/commit`);
    expect(done.status).toBe(200);
    const after = new Database(path.join(dataDir, 'specimetry.db'), { readonly: true });
    try {
      expect(valuesOf(after, s.studyId)).toBe(100_000);
    } finally {
      after.close();
    }
    server.kill('SIGTERM');
  }, 180_000);
});
