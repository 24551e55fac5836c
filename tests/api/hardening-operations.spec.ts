import Database from 'better-sqlite3';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import http from 'node:http';
import net from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Writable } from 'node:stream';
import pino from 'pino';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import { createContext } from '../../server/bootstrap.js';
import { loadConfig } from '../../server/config.js';
import { DEMO_PASSWORD } from '../../server/services/seed.js';
import { progressRegistry } from '../../server/ops/progress.js';
import { Client, signIn, startTestApp } from './harness.js';

// Operations: health with migration level, request ids in the structured log, graceful shutdown.
// Expectations: the migration journal drizzle/meta/_journal.json (the tags the code ships), and
// Node's http.Server.close() contract (nodejs.org/api/http.html#serverclosecallback: stops accepting,
// lets open requests finish).

const dirs: string[] = [];
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));
function tempDir(): string {
  const d = mkdtempSync(path.join(tmpdir(), 'specimetry-ops-'));
  dirs.push(d);
  return d;
}

describe('health and logs', () => {
  it('reports the migration level the database is at, as listed in the migration journal', async () => {
    const lines: string[] = [];
    const sink = new Writable({ write: (chunk: Buffer, _e, cb) => (lines.push(...chunk.toString().split('\n').filter(Boolean)), cb()) });
    const config = loadConfig({ DATA_DIR: tempDir(), LOG_LEVEL: 'info' });
    const running = await createContext(config, pino({ level: 'info' }, sink));
    try {
      const { app } = createApp(running.ctx);
      const journal = JSON.parse(readFileSync('drizzle/meta/_journal.json', 'utf8')) as { entries: { tag: string }[] };
      const health = await request(app).get('/api/health');
      expect(health.status).toBe(200);
      expect(health.body).toMatchObject({ status: 'ok', db: 'ok', migrations: { applied: journal.entries.length, latest: journal.entries.at(-1)!.tag } });

      // An id sent by a proxy is kept, echoed and logged; a missing or unsafe one is replaced.
      const kept = await request(app).get('/api/config').set('X-Request-Id', 'bench-run-42');
      expect(kept.headers['x-request-id']).toBe('bench-run-42');
      const made = await request(app).get('/api/config').set('X-Request-Id', 'has spaces; and "quotes"');
      const madeId = made.headers['x-request-id'] as string;
      expect(madeId).toMatch(/^[0-9a-f-]{36}$/);
      const failed = await request(app).get('/api/no-such-route');
      expect(failed.status).toBe(404);

      const logged = lines.map((l) => JSON.parse(l) as { req?: { id?: string; url?: string }; res?: { statusCode?: number }; level: number });
      const byId = (id: string) => logged.find((l) => l.req?.id === id);
      expect(byId('bench-run-42')?.req?.url).toBe('/api/config');
      expect(byId(madeId)).toBeDefined();
      const notFound = byId(failed.headers['x-request-id'] as string);
      expect(notFound?.res?.statusCode).toBe(404);
      expect(notFound?.level).toBe(40); // pino "warn" for 4xx, as app.ts configures
    } finally {
      await running.close();
    }
  });
});

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

async function waitForHealth(port: number, child: ChildProcess): Promise<void> {
  for (let i = 0; i < 200; i++) {
    if (child.exitCode !== null) throw new Error(`server exited early with ${child.exitCode}`);
    const ok = await new Promise<boolean>((resolve) => {
      http.get({ host: '127.0.0.1', port, path: '/api/health', agent: false }, (res) => (res.resume(), resolve(res.statusCode === 200))).on('error', () => resolve(false));
    });
    if (ok) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error('server did not become healthy');
}

describe('graceful shutdown', () => {
  it('lets an in-flight request finish after SIGTERM, refuses new ones, exits 0 and leaves the database intact', async () => {
    const dataDir = tempDir();
    const port = await freePort();
    const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
      env: { ...process.env, DATA_DIR: dataDir, PORT: String(port), HOST: '127.0.0.1', LOG_LEVEL: 'warn', DEMO: '1' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
    await waitForHealth(port, child);

    // The XSRF cookie and its session first (sign-in is CSRF-protected like every mutating call).
    const primed = await new Promise<http.IncomingMessage>((resolve, reject) =>
      http.get({ host: '127.0.0.1', port, path: '/api/config', agent: false }, resolve).on('error', reject),
    );
    primed.resume();
    const cookies = (primed.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]!);
    const xsrf = decodeURIComponent(cookies.find((c) => c.startsWith('XSRF-TOKEN='))!.slice('XSRF-TOKEN='.length));

    // A slow request: the body arrives in two halves with SIGTERM in between.
    const body = JSON.stringify({ email: 'engineer@specimetry.test', password: DEMO_PASSWORD });
    const half = Math.floor(body.length / 2);
    let refusedWhileStopping: boolean | undefined;
    const response = new Promise<{ status: number; text: string }>((resolve, reject) => {
      const req = http.request(
        { host: '127.0.0.1', port, path: '/api/auth/login', method: 'POST', agent: false, headers: { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body), cookie: cookies.join('; '), 'x-xsrf-token': xsrf } },
        (res) => {
          let text = '';
          res.on('data', (d: Buffer) => (text += d.toString()));
          res.on('end', () => resolve({ status: res.statusCode ?? 0, text }));
        },
      );
      req.on('error', reject);
      req.write(body.slice(0, half));
      setTimeout(() => {
        child.kill('SIGTERM');
        setTimeout(async () => {
          // Meanwhile the listener is closed: a new connection is refused.
          refusedWhileStopping = await new Promise<boolean>((r) => {
            const s = net.connect(port, '127.0.0.1');
            s.once('connect', () => (s.destroy(), r(false)));
            s.once('error', () => r(true));
          });
          req.end(body.slice(half));
        }, 700);
      }, 300);
    });

    const res = await response;
    expect(refusedWhileStopping).toBe(true);
    expect(res.status).toBe(200);
    expect(JSON.parse(res.text).user.email).toBe('engineer@specimetry.test');
    expect(await exited).toBe(0);

    const db = new Database(path.join(dataDir, 'specimetry.db'), { readonly: true });
    try {
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
      // The write made by the in-flight request reached the file before the database closed.
      const signIns = db.prepare("select count(*) as n from audit_events where action = 'sign-in'").get() as { n: number };
      expect(signIns.n).toBe(1);
    } finally {
      db.close();
    }
  });
});

describe('progress of long operations', () => {
  it('GET /api/operations/:id shows the starter the progress of an operation and hides it from others', async () => {
    const t = await startTestApp();
    try {
      const engineer = await signIn(t.app, 'engineer');
      const other = await signIn(t.app, 'statistician');
      const me = (await engineer.get('/api/me')).body.user as { id: number };
      // What an import handler does through startOperation(): the client chose the id.
      const op = progressRegistry(t.ctx).start(me.id, 'import', 'import-7f3a-0001');
      op.update('validating', 20_000, 50_000);
      const seen = await engineer.get('/api/operations/import-7f3a-0001');
      expect(seen.status).toBe(200);
      expect(seen.headers['cache-control']).toBe('no-store');
      expect(seen.body.operation).toMatchObject({ kind: 'import', state: 'running', phase: 'validating', done: 20_000, total: 50_000, percent: 40 });
      expect((await other.get('/api/operations/import-7f3a-0001')).status).toBe(404);
      expect((await new Client(t.app).get('/api/operations/import-7f3a-0001')).status).toBe(401);
      expect((await engineer.get('/api/operations/x')).status).toBe(400);
      op.finish();
      expect((await engineer.get('/api/operations/import-7f3a-0001')).body.operation).toMatchObject({ state: 'done', percent: 100 });
    } finally {
      await t.close();
    }
  });
});
