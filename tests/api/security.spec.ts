import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SESSION_COOKIE } from '../../server/app.js';
import { DEMO_PASSWORD } from '../../server/services/seed.js';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { seedStudy, studyFingerprint, type SeededStudy } from './hardening-study.js';

// Security re-checks. Expectations from the OWASP cheat sheets: HTTP Headers (CSP, nosniff,
// frame-ancestors / X-Frame-Options), Session Management (renew the session id on sign-in; HttpOnly,
// SameSite cookies), CSRF Prevention (token in a custom header for state-changing requests),
// Authentication (limit failed sign-in attempts; RFC 6585 §4: 429 with Retry-After).

let t: TestApp;
let s: SeededStudy;

beforeAll(async () => {
  t = await startTestApp({ LOGIN_LIMIT_PER_ACCOUNT: '3', LOGIN_LIMIT_PER_IP: '1000' });
  s = seedStudy(t.ctx, { members: [{ email: 'supervisor@specimetry.test', role: 'viewer' }, { email: 'statistician@specimetry.test', role: 'reviewer' }] });
});
afterAll(() => t.close());

const cookieOf = (res: request.Response, name: string) =>
  ((res.headers['set-cookie'] as unknown as string[] | undefined) ?? []).find((c) => c.startsWith(`${name}=`));

describe('security headers', () => {
  it('sends CSP, nosniff, frame protection and no framework banner on API and page responses', async () => {
    for (const url of ['/api/health', '/studies']) {
      const res = await request(t.app).get(url);
      const csp = String(res.headers['content-security-policy']);
      expect(csp).toContain("default-src 'self'");
      expect(csp).toContain("script-src 'self'");
      expect(csp).toContain("object-src 'none'");
      expect(csp).toContain("frame-ancestors 'none'");
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(res.headers['x-frame-options']).toBe('SAMEORIGIN');
      expect(res.headers['referrer-policy']).toBe('no-referrer');
      expect(res.headers['x-powered-by']).toBeUndefined();
    }
  });
});

describe('sessions and CSRF', () => {
  it('issues a new session id on sign-in (no fixation) and an HttpOnly, SameSite=Lax cookie', async () => {
    const client = new Client(t.app);
    const first = await client.agent.get('/api/config');
    const pre = cookieOf(first, SESSION_COOKIE);
    expect(pre).toBeDefined();
    const xsrf = decodeURIComponent(/XSRF-TOKEN=([^;]*)/.exec(cookieOf(first, 'XSRF-TOKEN')!)![1]!);
    const login = await client.agent.post('/api/auth/login').set('X-XSRF-TOKEN', xsrf).send({ email: 'engineer@specimetry.test', password: DEMO_PASSWORD });
    expect(login.status).toBe(200);
    const post = cookieOf(login, SESSION_COOKIE)!;
    expect(post.split(';')[0]).not.toBe(pre!.split(';')[0]);
    expect(post).toMatch(/HttpOnly/i);
    expect(post).toMatch(/SameSite=Lax/i);
    // The pre-sign-in id an attacker could have planted is not signed in.
    const planted = await request(t.app).get('/api/me').set('Cookie', pre!.split(';')[0]!);
    expect(planted.status).toBe(401);
    // The XSRF token is renewed with the session as well.
    expect(cookieOf(login, 'XSRF-TOKEN')).toBeDefined();
    expect(cookieOf(login, 'XSRF-TOKEN')).not.toContain(encodeURIComponent(xsrf));
  });

  it('refuses state-changing cookie calls without the XSRF header or with a wrong one, changing nothing', async () => {
    const eng = await signIn(t.app, 'engineer');
    const before = studyFingerprint(t.ctx, s.studyId);
    const url = `/api/studies/${s.studyId}/runs/${s.runs[0]!.id}`;
    const none = await eng.agent.patch(url).send({ version: 1, notes: 'csrf' });
    expect(none.status).toBe(403);
    expect(none.body.message).toContain('XSRF');
    const wrong = await eng.agent.patch(url).set('X-XSRF-TOKEN', 'forged').send({ version: 1, notes: 'csrf' });
    expect(wrong.status).toBe(403);
    expect(studyFingerprint(t.ctx, s.studyId)).toBe(before);
    const right = await eng.patch(url, { version: 1, notes: 'legit' });
    expect(right.status).toBe(200);
  });
});

describe('role matrix on study data', () => {
  it('owner edits; viewer and reviewer read but cannot edit; non-members and anonymous see nothing', async () => {
    const runs = `/api/studies/${s.studyId}/runs`;
    const edit = `/api/studies/${s.studyId}/runs/${s.runs[1]!.id}`;
    const expected: [string, 'engineer' | 'supervisor' | 'statistician' | 'admin', number, number][] = [
      ['owner', 'engineer', 200, 200],
      ['viewer', 'supervisor', 200, 403],
      ['reviewer', 'statistician', 200, 403],
      ['admin (manages all)', 'admin', 200, 200],
    ];
    let version = 1;
    for (const [label, role, read, write] of expected) {
      const c = await signIn(t.app, role);
      expect((await c.get(runs)).status, `${label} read`).toBe(read);
      const res = await c.patch(edit, { version, operator: label });
      expect(res.status, `${label} write`).toBe(write);
      if (res.status === 200) version = res.body.run.version as number;
    }
    const other = seedStudy(t.ctx, { title: 'Not shared' });
    const supervisor = await signIn(t.app, 'supervisor');
    expect((await supervisor.get(`/api/studies/${other.studyId}/runs`)).status).toBe(404);
    expect((await request(t.app).get(runs)).status).toBe(401);
    const stat = await signIn(t.app, 'statistician');
    expect((await stat.post('/api/studies', { title: 'not allowed' })).status).toBe(403);
  });
});

// Last: it locks the supervisor account for the rest of this file.
describe('rate limits', () => {
  it('limits failed sign-ins per account with 429 and Retry-After, and counts no successes', async () => {
    const client = new Client(t.app);
    await client.prime();
    const attempt = (password: string) => client.post('/api/auth/login', { email: 'supervisor@specimetry.test', password });
    for (let i = 0; i < 3; i++) expect((await attempt('wrong password')).status).toBe(401);
    const limited = await attempt('wrong password');
    expect(limited.status).toBe(429);
    expect(Number(limited.headers['retry-after'])).toBeGreaterThan(0);
    expect(limited.body.message).toMatch(/Too many sign-in attempts for this account/);
    // Even the right password waits: the limit protects the account, not the guess.
    expect((await attempt(DEMO_PASSWORD)).status).toBe(429);
    // Other accounts are not locked by it.
    expect((await new Client(t.app).post('/api/auth/login', { email: 'admin@specimetry.test', password: DEMO_PASSWORD })).status).toBe(200);
  });
});
