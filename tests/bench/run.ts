import { execFileSync, fork } from 'node:child_process';
import { existsSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { brotliCompressSync, constants as zlibConstants, gzipSync } from 'node:zlib';
import { csv } from '../api/hardening-files.js';
import { prepareData, signInHttp, startServer } from './bench-server.js';
import { load, type LoadFigure } from './load-bench.js';

// npm run bench — load, import and bundle figures for the README's performance section, then the
// statistics benchmark (tests/bench/stats-bench.ts, owned by the statistics engineers). Never part
// of npm test. BENCH_SECONDS sets the length of each load run (default 5).

const SECONDS = Number(process.env['BENCH_SECONDS'] ?? 5);
const CONNECTIONS = [1, 10, 50];
const CLIENT_DIR = path.resolve('dist/specimetry/browser');
const PREVIEW_TIMEOUT_MS = 60_000;
/** What Chromium 156 sends (common practice, no source: read off the browser's request headers). */
const BROWSER_ACCEPT_ENCODING = 'gzip, deflate, br, zstd';

/** Starts tests/bench/floor-server.mjs in its own process, serving `body` as-is. */
async function floorServer(body: Buffer, encoding: string): Promise<{ url: string; stop: () => void }> {
  const file = path.join(os.tmpdir(), `specimetry-floor-${process.pid}.bin`);
  writeFileSync(file, body);
  const child = fork(path.resolve('tests/bench/floor-server.mjs'), [file, encoding], { stdio: 'ignore' });
  const port = await new Promise<number>((resolve, reject) => {
    child.once('message', (m) => resolve((m as { port: number }).port));
    child.once('exit', (code) => reject(new Error(`the floor server exited (${code})`)));
  });
  return {
    url: `http://127.0.0.1:${port}/`,
    stop: () => {
      child.kill('SIGTERM');
      rmSync(file, { force: true });
    },
  };
}

function machine(): string {
  return `${os.cpus()[0]?.model ?? 'unknown CPU'} x${os.cpus().length}, ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB, Node ${process.version}, ${os.platform()} ${os.release()}`;
}

function printLoad(rows: LoadFigure[]): void {
  console.log('| route | clients | requests | req/s | p50 ms | p95 ms | p99 ms | errors / non-2xx |');
  console.log('|---|---:|---:|---:|---:|---:|---:|---:|');
  for (const r of rows) console.log(`| ${r.name} | ${r.connections} | ${r.requests} | ${r.rps.toFixed(1)} | ${r.p50.toFixed(1)} | ${r.p95.toFixed(1)} | ${r.p99.toFixed(1)} | ${r.errors} / ${r.non2xx} |`);
}

async function benchServer(): Promise<void> {
  console.log('Preparing a 10 000-run study (4 factors, values filled) and a 50 000-run study ...');
  const { dataDir, sheet, importTarget } = await prepareData();
  const { base, child } = await startServer(dataDir);
  try {
    const auth = await signInHttp(base);
    const headers = { cookie: auth.cookie, 'x-xsrf-token': auth.xsrf };
    const rows: LoadFigure[] = [];
    // The run sheet is fetched as the grid fetches it: in column layout (?layout=columns), with the
    // Accept-Encoding a current browser sends, so the server answers with its cached Brotli body.
    // First load: not conditional (no If-None-Match), the worst case. Revisit: the browser kept the
    // answer and revalidates it with the ETag (Cache-Control: private, no-cache), as it does every
    // later time the sheet is opened while the data have not changed. The row layout (what a script
    // gets without ?layout) is measured too.
    const sheetUrl = `${base}/api/studies/${sheet.studyId}/runs?layout=columns`;
    const rowsUrl = `${base}/api/studies/${sheet.studyId}/runs`;
    const sheetHeaders = { ...headers, 'accept-encoding': BROWSER_ACCEPT_ENCODING };
    const first = await fetch(sheetUrl, { headers: sheetHeaders });
    const sheetBytes = Buffer.from(await first.arrayBuffer());
    const rowsBytes = Buffer.from(await (await fetch(rowsUrl, { headers: sheetHeaders })).arrayBuffer());
    const encoding = first.headers.get('content-encoding') ?? '';
    // fetch decodes the body; the bytes on the wire are the encoded form, made again here (same settings as the server) for the floor server
    const encode = (b: Buffer) => (encoding === 'br' ? brotliCompressSync(b, { params: { [zlibConstants.BROTLI_PARAM_QUALITY]: 6, [zlibConstants.BROTLI_PARAM_MODE]: zlibConstants.BROTLI_MODE_TEXT } }) : encoding === 'gzip' ? gzipSync(b, { level: 6 }) : b);
    const wire = encode(sheetBytes);
    const etag = first.headers.get('etag') ?? '';
    for (const c of CONNECTIONS) rows.push(await load('GET run sheet as the grid loads it (columns), first load', { url: sheetUrl, connections: c, seconds: SECONDS, headers: sheetHeaders }));
    for (const c of CONNECTIONS) rows.push(await load('GET run sheet, revisit (If-None-Match → 304)', { url: sheetUrl, connections: c, seconds: SECONDS, headers: { ...sheetHeaders, 'if-none-match': etag } }));
    const floor = await floorServer(wire, encoding);
    try {
      for (const c of CONNECTIONS) rows.push(await load('floor: bare node:http, the same bytes', { url: floor.url, connections: c, seconds: SECONDS, headers: {} }));
    } finally {
      floor.stop();
    }
    for (const c of CONNECTIONS) rows.push(await load('GET run sheet, row layout (scripts), first load', { url: rowsUrl, connections: c, seconds: SECONDS, headers: sheetHeaders }));
    console.log(
      `\nLoad (${SECONDS} s per run; target: run-sheet p95 <= 50 ms at 50 clients). Run sheet, 10 000 runs: columns ${(sheetBytes.length / 1e6).toFixed(2)} MB JSON, ${(wire.length / 1e3).toFixed(0)} kB on the wire; ` +
        `rows ${(rowsBytes.length / 1e6).toFixed(2)} MB JSON, ${(encode(rowsBytes).length / 1e3).toFixed(0)} kB on the wire (${encoding || 'identity'}):`,
    );
    printLoad(rows);

    await benchImport(base, headers, importTarget.studyId, importTarget.runs.map((r) => r.code));

    // Last, because a slow preview keeps the (single-threaded) server busy after the client gives up.
    const spec = JSON.stringify({ response: 'H', factors: ['W', 'A', 'K', 'O'] });
    const previewUrl = `${base}/api/studies/${sheet.studyId}/analyses/preview`;
    const previewHeaders = { ...headers, 'content-type': 'application/json', 'accept-encoding': BROWSER_ACCEPT_ENCODING };
    const t0 = performance.now();
    const probe = await fetch(previewUrl, { method: 'POST', headers: previewHeaders, body: spec, signal: AbortSignal.timeout(PREVIEW_TIMEOUT_MS) }).then(
      (r) => r,
      () => null,
    );
    const single = performance.now() - t0;
    console.log('\nAnalysis preview (10 000 runs, 4 factors, default model; target p95 <= 200 ms):');
    if (probe === null) {
      console.log(`  NOTE: one preview did not answer within ${PREVIEW_TIMEOUT_MS / 1000} s; load runs skipped.`);
    } else if (probe.status === 404) {
      console.log('  NOTE: POST /api/studies/:id/analyses/preview answered 404 — not built yet; skipped.');
    } else if (!probe.ok) {
      console.log(`  NOTE: the preview answered ${probe.status}: ${(await probe.text()).slice(0, 200)} — skipped.`);
    } else if (single > 5000) {
      console.log(`  one request took ${(single / 1000).toFixed(1)} s; load runs skipped (they would only queue).`);
    } else {
      console.log(`  first request: ${single.toFixed(0)} ms`);
      const previews: LoadFigure[] = [];
      for (const c of CONNECTIONS) {
        previews.push(await load('POST analysis preview', { url: previewUrl, method: 'POST', connections: c, seconds: SECONDS, headers: previewHeaders, body: spec }));
      }
      printLoad(previews);
    }
  } finally {
    // A server still busy with a slow request cannot run its SIGTERM handler: SIGKILL after 5 s.
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGTERM');
    const force = setTimeout(() => child.kill('SIGKILL'), 5000);
    await exited;
    clearTimeout(force);
    rmSync(dataDir, { recursive: true, force: true });
  }
}

async function benchImport(base: string, headers: Record<string, string>, studyId: number, codes: string[]): Promise<void> {
  const file = csv([['Run', 'H', 'r', 'Notes'], ...codes.map((code, i) => [code, (0.5 + (i % 97) / 100).toFixed(3), (1 + (i % 89) / 50).toFixed(3), `batch ${i % 7}`])]);
  const form = new FormData();
  form.set('file', new Blob([file], { type: 'text/csv' }), 'bench-50000.csv');
  const t0 = performance.now();
  const up = await fetch(`${base}/api/studies/${studyId}/imports`, { method: 'POST', headers, body: form });
  const t1 = performance.now();
  const preview = (await up.json()) as { import?: { id: number; errorCount: number }; message?: string };
  if (!up.ok || !preview.import) throw new Error(`import upload failed: ${up.status} ${preview.message}`);
  const commit = await fetch(`${base}/api/studies/${studyId}/imports/${preview.import.id}/commit`, { method: 'POST', headers });
  const t2 = performance.now();
  if (!commit.ok) throw new Error(`import commit failed: ${commit.status} ${(await commit.text()).slice(0, 200)}`);
  console.log(`\n${codes.length}-row CSV import (${(Buffer.byteLength(file) / 2 ** 20).toFixed(1)} MB, 2 responses + notes; target <= 3 s):`);
  console.log(`  upload + parse + validate (preview): ${((t1 - t0) / 1000).toFixed(2)} s`);
  console.log(`  commit (one transaction):            ${((t2 - t1) / 1000).toFixed(2)} s`);
  console.log(`  total:                               ${((t2 - t0) / 1000).toFixed(2)} s`);
}

/** Initial JS = the scripts index.html loads (module entry + modulepreload), gzip level 9 as a server would send. */
function benchBundle(): void {
  if (!existsSync(path.join(CLIENT_DIR, 'index.html'))) {
    console.log('\nNo production build found; running npm run build ...');
    try {
      execFileSync('npm', ['run', '--silent', 'build'], { stdio: 'inherit' });
    } catch {
      // Expected while client code in the tree does not compile: report it and go on with the rest.
      console.log('NOTE: npm run build failed (see above); bundle size not measured.');
      return;
    }
  }
  const html = readFileSync(path.join(CLIENT_DIR, 'index.html'), 'utf8');
  // Initial JS: the entry scripts and, transitively, every chunk they import statically
  // (`from"./chunk-….js"` / `import"./chunk-….js"`); `import("…")` chunks are lazy and not counted.
  const queue = [...html.matchAll(/<script[^>]+src="([^"]+)"/g), ...html.matchAll(/<link[^>]+rel="modulepreload"[^>]+href="([^"]+)"/g)].map((m) => m[1]!);
  const files = new Set<string>();
  while (queue.length) {
    const f = queue.pop()!;
    if (files.has(f)) continue;
    files.add(f);
    const text = readFileSync(path.join(CLIENT_DIR, f), 'utf8');
    for (const m of text.matchAll(/(?:from|import)\s*"\.\/([\w.-]+\.js)"/g)) queue.push(m[1]!);
  }
  let raw = 0;
  let gz = 0;
  for (const f of files) {
    const buf = readFileSync(path.join(CLIENT_DIR, f));
    raw += buf.length;
    gz += gzipSync(buf, { level: 9 }).length;
  }
  const css = [...html.matchAll(/<link[^>]+rel="stylesheet"[^>]+href="([^"]+)"/g)].map((m) => readFileSync(path.join(CLIENT_DIR, m[1]!)));
  console.log(`\nInitial client bundle (target <= 400 kB gzip JS): ${files.size} script files, ${(raw / 1024).toFixed(1)} kB raw, ${(gz / 1024).toFixed(1)} kB gzip` + (css.length ? `; CSS ${(css.reduce((a, b) => a + gzipSync(b, { level: 9 }).length, 0) / 1024).toFixed(1)} kB gzip` : ''));
}

async function benchStats(): Promise<void> {
  const file = path.resolve('tests/bench/stats-bench.ts');
  if (!existsSync(file)) {
    console.log('\nNOTE: tests/bench/stats-bench.ts does not exist yet; statistics benchmark skipped.');
    return;
  }
  const mod = (await import('./stats-bench.js')) as { runStatsBench?: () => Promise<void> };
  if (typeof mod.runStatsBench !== 'function') {
    console.log('\nNOTE: stats-bench.ts exports no runStatsBench(); skipped.');
    return;
  }
  console.log('\nStatistics engine:');
  await mod.runStatsBench();
}

async function main(): Promise<void> {
  console.log(`Specimetry benchmark — ${new Date().toISOString()}\nMachine: ${machine()}\n`);
  await benchServer();
  benchBundle();
  await benchStats();
}

main().catch((err: unknown) => {
  console.error('Benchmark failed:', err);
  process.exit(1);
});
