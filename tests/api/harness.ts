import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pino from 'pino';
import request from 'supertest';
import type { Express } from 'express';
import type { Router } from 'express';
import { loadConfig, type Config } from '../../server/config.js';
import { createApp } from '../../server/app.js';
import { createContext, type Running } from '../../server/bootstrap.js';
import type { AppContext } from '../../server/context.js';
import { DEMO_PASSWORD } from '../../server/services/seed.js';
import type { Role } from '../../shared/roles.js';

export interface TestApp {
  app: Express;
  api: Router;
  ctx: AppContext;
  running: Running;
  dataDir: string;
  close(): Promise<void>;
}

/** A fresh app on a fresh temporary SQLite file (one per test file), demo accounts seeded. */
export async function startTestApp(env: Record<string, string> = {}, overrides: Partial<Config> = {}): Promise<TestApp> {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'specimetry-test-'));
  const config = { ...loadConfig({ DATA_DIR: dataDir, DEMO: '1', LOG_LEVEL: 'silent', ...env }), ...overrides };
  const running = await createContext(config, pino({ level: 'silent' }));
  const { app, api } = createApp(running.ctx);
  return {
    app,
    api,
    ctx: running.ctx,
    running,
    dataDir,
    async close() {
      await running.close();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export const DEMO_EMAIL: Record<Role, string> = {
  admin: 'admin@specimetry.test',
  engineer: 'engineer@specimetry.test',
  statistician: 'statistician@specimetry.test',
  supervisor: 'supervisor@specimetry.test',
};

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/**
 * A browser-like client: keeps the session cookie and, like Angular's HttpClient, copies the
 * XSRF-TOKEN cookie into the X-XSRF-TOKEN header on mutating requests.
 */
export class Client {
  readonly agent: ReturnType<typeof request.agent>;
  xsrf = '';
  constructor(app: Express) {
    this.agent = request.agent(app);
  }

  private capture(res: request.Response): request.Response {
    const raw = res.headers['set-cookie'] as unknown as string[] | undefined;
    for (const c of raw ?? []) {
      const m = /^XSRF-TOKEN=([^;]*)/.exec(c);
      if (m) this.xsrf = decodeURIComponent(m[1]!);
    }
    return res;
  }

  /** Fetches the XSRF cookie (any GET does); needed before the first mutating call. */
  async prime(): Promise<void> {
    this.capture(await this.agent.get('/api/config'));
  }

  async call(method: Method, url: string, body?: unknown): Promise<request.Response> {
    if (!this.xsrf && method !== 'get') await this.prime();
    let req = this.agent[method](url);
    if (method !== 'get') req = req.set('X-XSRF-TOKEN', this.xsrf);
    const res = body === undefined ? await req : await req.send(body as object);
    return this.capture(res);
  }

  /** Build a request with the XSRF header set (for multipart uploads etc.). */
  async raw(method: Method, url: string): Promise<request.Test> {
    if (!this.xsrf) await this.prime();
    return this.agent[method](url).set('X-XSRF-TOKEN', this.xsrf);
  }

  get = (url: string) => this.call('get', url);
  post = (url: string, body?: unknown) => this.call('post', url, body ?? {});
  put = (url: string, body?: unknown) => this.call('put', url, body ?? {});
  patch = (url: string, body?: unknown) => this.call('patch', url, body ?? {});
  delete = (url: string, body?: unknown) => this.call('delete', url, body);
}

export async function signIn(app: Express, who: Role | { email: string; password: string }): Promise<Client> {
  const client = new Client(app);
  const creds = typeof who === 'string' ? { email: DEMO_EMAIL[who], password: DEMO_PASSWORD } : who;
  const res = await client.post('/api/auth/login', creds);
  if (res.status !== 200) throw new Error(`sign-in failed for ${creds.email}: ${res.status} ${JSON.stringify(res.body)}`);
  return client;
}

/** Latest message in the fake mailbox for an address, read straight from the database. */
export function lastMailTo(ctx: AppContext, address: string): { subject: string; textBody: string } | undefined {
  const row = ctx.db.$client
    .prepare('select subject, text_body as textBody from mail_messages where recipients like ? order by id desc limit 1')
    .get(`%${address}%`) as { subject: string; textBody: string } | undefined;
  return row;
}

/** Mail delivery through SMTP is asynchronous at the fake's end: wait until it has stored the message. */
export async function waitForMail(ctx: AppContext, address: string, after = 0): Promise<{ subject: string; textBody: string }> {
  for (let i = 0; i < 100; i++) {
    const row = ctx.db.$client
      .prepare('select id, subject, text_body as textBody from mail_messages where recipients like ? and id > ? order by id desc limit 1')
      .get(`%${address}%`, after) as { id: number; subject: string; textBody: string } | undefined;
    if (row) return row;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail arrived for ${address}`);
}

export function linkIn(text: string): URL {
  const m = /(https?:\/\/\S+)/.exec(text);
  if (!m) throw new Error(`no link in mail: ${text}`);
  return new URL(m[1]!);
}
