import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { ConfigError, loadConfig } from '../../server/config.js';
import { CLIENT_DIR } from '../../server/app.js';
import { startTestApp, type TestApp } from './harness.js';

// Start-up contract of issue 2 (configuration validated at start, secret persisted, demo on/off,
// real SMTP vs the local fake, SPA fallback, create-admin). Expected behaviour: the text;
// common practice, no source.

const dirs: string[] = [];
const tmp = () => {
  const d = mkdtempSync(path.join(tmpdir(), 'specimetry-cfg-'));
  dirs.push(d);
  return d;
};
const apps: TestApp[] = [];
afterAll(async () => {
  for (const a of apps) await a.close();
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

describe('configuration', () => {
  it('fails fast and names every bad variable', () => {
    let err: unknown;
    try {
      loadConfig({ DATA_DIR: tmp(), PORT: 'eighty', SMTP_HOST: 'mail.lab.test', DEMO: 'maybe' });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ConfigError);
    expect(String((err as Error).message)).toMatch(/PORT/);
    expect(String((err as Error).message)).toMatch(/DEMO/);
    expect(() => loadConfig({ DATA_DIR: tmp(), SMTP_HOST: 'mail.lab.test' })).toThrow(/SMTP_PORT: required when SMTP_HOST is set/);
    expect(() => loadConfig({ DATA_DIR: tmp(), SESSION_SECRET: 'short' })).toThrow(/SESSION_SECRET must be at least 32 characters/);
  });

  it('defaults PORT 3000 and generates the session secret once, then keeps it in DATA_DIR', () => {
    const dir = tmp();
    const a = loadConfig({ DATA_DIR: dir });
    expect(a.port).toBe(3000);
    expect(a.sessionSecret.length).toBeGreaterThanOrEqual(32);
    expect(readFileSync(path.join(dir, 'session-secret'), 'utf8')).toBe(a.sessionSecret);
    expect(loadConfig({ DATA_DIR: dir }).sessionSecret).toBe(a.sessionSecret);
  });
});

describe('start-up modes', () => {
  it('DEMO=0 starts with no accounts at all', async () => {
    const t = await startTestApp({ DEMO: '0' });
    apps.push(t);
    const n = t.ctx.db.$client.prepare('select count(*) as n from users').get() as { n: number };
    expect(n.n).toBe(0);
  });

  it('with SMTP settings the built-in fake does not start and the outbox is not offered', async () => {
    const t = await startTestApp({ SMTP_HOST: '127.0.0.1', SMTP_PORT: '2525' });
    apps.push(t);
    expect(t.running.fakeSmtp).toBeNull();
    expect(t.ctx.mailer.fake).toBe(false);
    expect((await request(t.app).get('/api/config')).body.mailFake).toBe(false);
  });

  it('serves the client with an SPA fallback for deep links (or says how to build it)', async () => {
    const t = await startTestApp();
    apps.push(t);
    const res = await request(t.app).get('/studies/1/analysis');
    if (existsSync(path.join(CLIENT_DIR, 'index.html'))) {
      expect(res.status).toBe(200);
      expect(res.text).toMatch(/<sm-root/);
    } else {
      expect(res.status).toBe(503);
      expect(res.text).toMatch(/npm run build/);
    }
    expect((await request(t.app).get('/api/nothing-here')).status).toBe(404);
  });
});

describe('npm run create-admin', () => {
  it('creates the first administrator with the password from ADMIN_PASSWORD, and refuses a weak one', () => {
    const dir = tmp();
    const env = { ...process.env, DATA_DIR: dir, DEMO: '0', LOG_LEVEL: 'silent', ADMIN_PASSWORD: 'a long admin passphrase' };
    const out = execFileSync('npx', ['tsx', 'server/cli/create-admin.ts', '--email', 'Head.Of.Lab@lab.test', '--name', 'Head of Lab'], { env, encoding: 'utf8' });
    expect(out).toMatch(/Administrator head\.of\.lab@lab\.test created/);
    const db = new Database(path.join(dir, 'specimetry.db'), { readonly: true });
    expect(db.prepare('select role from users where email = ?').get('head.of.lab@lab.test')).toEqual({ role: 'admin' });
    db.close();
    let code = 0;
    try {
      execFileSync('npx', ['tsx', 'server/cli/create-admin.ts', '--email', 'x@lab.test'], { env: { ...env, ADMIN_PASSWORD: 'short' }, encoding: 'utf8', stdio: 'pipe' });
    } catch (e) {
      code = (e as { status: number }).status;
    }
    expect(code).toBe(2);
  });
});
