import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import net from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pino from 'pino';
import { createContext } from '../../server/bootstrap.js';
import { loadConfig } from '../../server/config.js';
import type { AppContext } from '../../server/context.js';
import { DEMO_PASSWORD } from '../../server/services/seed.js';
import type { FactorInput } from '../../shared/studies.js';
import { seedStudy, type SeededStudy } from '../api/hardening-study.js';

/**
 * Benchmark fixtures: a data folder with big studies, and the real server started on it in its own
 * process (so the load generator does not share the server's event loop).
 */

export const BENCH_FACTORS: FactorInput[] = [
  { name: 'Neck width ratio', symbol: 'W', unit: '', kind: 'numeric', levels: ['0.4', '0.5', '0.6', '0.7', '0.8'].map((value) => ({ value })), tracksMeasured: false },
  { name: 'Notch angle', symbol: 'A', unit: 'deg', kind: 'numeric', levels: ['30', '40', '50', '60', '70'].map((value) => ({ value })), tracksMeasured: false },
  { name: 'Root radius ratio', symbol: 'K', unit: '', kind: 'numeric', levels: ['0.5', '1', '2', '4'].map((value) => ({ value })), tracksMeasured: false },
  { name: 'Orientation', symbol: 'O', unit: 'deg', kind: 'numeric', levels: ['0', '22.5', '45', '67.5', '90'].map((value) => ({ value })), tracksMeasured: false },
];

/** Invented response model with a W x A interaction and deterministic noise, so analyses have work to do. */
function fillValues(ctx: AppContext, s: SeededStudy): void {
  const c = ctx.db.$client;
  const resp = c.prepare('select id, symbol from responses where study_id = ?').all(s.studyId) as { id: number; symbol: string }[];
  const ins = c.prepare('insert into run_values (run_id, response_id, text, value) values (?, ?, ?, ?)');
  c.transaction(() => {
    s.runs.forEach((r, i) => {
      const w = Number(r.settings['W']);
      const a = Number(r.settings['A']);
      const noise = (((i * 2654435761) >>> 0) % 1000) / 1000 - 0.5;
      const h = 0.6 + 0.4 * w + 0.002 * a + 0.01 * w * a + 0.05 * noise;
      for (const x of resp) {
        const v = x.symbol === 'H' ? h : 1 + h / 2;
        ins.run(r.id, x.id, v.toFixed(3), Number(v.toFixed(3)));
      }
    });
  })();
  c.prepare("update studies set status = 'collecting' where id = ?").run(s.studyId);
}

export async function prepareData(): Promise<{ dataDir: string; sheet: SeededStudy; importTarget: SeededStudy }> {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'specimetry-bench-'));
  const running = await createContext(loadConfig({ DATA_DIR: dataDir, LOG_LEVEL: 'silent' }), pino({ level: 'silent' }));
  try {
    const sheet = seedStudy(running.ctx, { title: 'Bench: 10 000-run sheet', factors: BENCH_FACTORS, replicates: 20 });
    fillValues(running.ctx, sheet);
    const importTarget = seedStudy(running.ctx, { title: 'Bench: 50 000-run import', factors: BENCH_FACTORS, replicates: 100 });
    return { dataDir, sheet, importTarget };
  } finally {
    await running.close();
  }
}

export async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = net.createServer().listen(0, '127.0.0.1', () => {
      const port = (srv.address() as net.AddressInfo).port;
      srv.close(() => resolve(port));
    });
  });
}

export async function startServer(dataDir: string): Promise<{ base: string; child: ChildProcess }> {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    env: { ...process.env, DATA_DIR: dataDir, PORT: String(port), LOG_LEVEL: 'error', DEMO: '1', MAX_UPLOAD_MB: '60' },
    stdio: 'ignore',
  });
  const base = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 300; i++) {
    if (await fetch(`${base}/api/health`).then((r) => r.ok, () => false)) return { base, child };
    await new Promise((r) => setTimeout(r, 100));
  }
  child.kill('SIGKILL');
  throw new Error('the server did not start');
}

/** Signs in as the demo engineer; returns the Cookie header and the XSRF token for mutating calls. */
export async function signInHttp(base: string): Promise<{ cookie: string; xsrf: string }> {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const c of res.headers.getSetCookie()) {
      const pair = c.split(';')[0]!;
      jar.set(pair.slice(0, pair.indexOf('=')), pair.slice(pair.indexOf('=') + 1));
    }
  };
  keep(await fetch(`${base}/api/config`));
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  const xsrf = () => decodeURIComponent(jar.get('XSRF-TOKEN') ?? '');
  const res = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { cookie: cookie(), 'x-xsrf-token': xsrf(), 'content-type': 'application/json' }, body: JSON.stringify({ email: 'engineer@specimetry.test', password: DEMO_PASSWORD }) });
  if (!res.ok) throw new Error(`sign-in failed: ${res.status}`);
  keep(res);
  return { cookie: cookie(), xsrf: xsrf() };
}
