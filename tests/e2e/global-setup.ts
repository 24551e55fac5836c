import { type ChildProcess, spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { get } from 'node:http';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { CHROMIUM_PATH } from './browser';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
  }
}

const CLIENT_INDEX = path.resolve('dist/specimetry/browser/index.html');

/** Asks the OS for a free port (listen on 0), then releases it for the server to take. */
function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

/** GET /api/health without a keep-alive pool (fetch's would keep the test runner from exiting). */
function healthStatus(baseUrl: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const req = get(`${baseUrl}/api/health`, { agent: false }, (res) => {
      res.resume();
      resolve(res.statusCode ?? 0);
    });
    req.once('error', reject);
  });
}

async function waitForHealth(baseUrl: string, child: ChildProcess, output: () => string): Promise<void> {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The Specimetry server exited with code ${child.exitCode} before it was healthy:\n${output()}`);
    try {
      if ((await healthStatus(baseUrl)) === 200) return;
    } catch {
      // Connection refused until the server listens: that is what we are waiting for.
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`The Specimetry server did not answer GET /api/health within 60 s:\n${output()}`);
}

/** Starts the real server once for all e2e files and stops it afterwards. Builds nothing. */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  if (!existsSync(CHROMIUM_PATH)) {
    throw new Error(
      `End-to-end tests need Debian Chromium at ${CHROMIUM_PATH}, which is missing. Install it with ` +
        '`sudo apt-get install -y chromium` (never a downloaded browser), then run the tests again.',
    );
  }
  if (!existsSync(CLIENT_INDEX)) {
    throw new Error(`The built client is missing (${CLIENT_INDEX}). Run \`npm run build\` first (npm test does this).`);
  }

  const dataDir = mkdtempSync(path.join(tmpdir(), 'specimetry-e2e-'));
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  let log = '';
  const child = spawn('npx', ['tsx', 'server/index.ts'], {
    env: { ...process.env, PORT: String(port), HOST: '127.0.0.1', DATA_DIR: dataDir, DEMO: '1', PUBLIC_URL: baseUrl, LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'pipe', 'pipe'],
    // Own process group: npx -> tsx -> node is three processes, and all of them must stop at the end.
    detached: true,
  });
  const signalGroup = (signal: NodeJS.Signals) => {
    try {
      if (child.pid) process.kill(-child.pid, signal);
    } catch {
      // ESRCH: the group has already exited, which is what we wanted.
    }
  };
  const keep = (chunk: Buffer) => {
    log = (log + chunk.toString()).slice(-20_000);
  };
  child.stdout?.on('data', keep);
  child.stderr?.on('data', keep);

  try {
    await waitForHealth(baseUrl, child, () => log);
  } catch (error) {
    signalGroup('SIGKILL');
    rmSync(dataDir, { recursive: true, force: true });
    throw error;
  }
  project.provide('baseUrl', baseUrl);

  return async () => {
    if (child.exitCode === null) {
      const exited = new Promise((resolve) => child.once('exit', resolve));
      signalGroup('SIGTERM');
      let timer: NodeJS.Timeout | undefined;
      await Promise.race([exited, new Promise((r) => (timer = setTimeout(r, 15_000)))]);
      clearTimeout(timer);
    }
    // Whatever is left of the group (a grandchild that ignored SIGTERM) goes now.
    signalGroup('SIGKILL');
    child.stdout?.destroy();
    child.stderr?.destroy();
    rmSync(dataDir, { recursive: true, force: true });
  };
}
