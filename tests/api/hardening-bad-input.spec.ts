import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn, startTestApp, type Client, type TestApp } from './harness.js';
import { csv, xlsx, zipBombXlsx } from './hardening-files.js';
import { seedStudy, studyFingerprint, type SeededStudy } from './hardening-study.js';

// Bad-input suite (issue 6): every class gets a clear 4xx naming the offending value, and the
// study's data are byte-for-byte unchanged (fingerprint of runs, values, measurements, audit rows).
// Sources for what counts as bad: RFC 4180 (CSV, comma delimiter), RFC 3629 (UTF-8; a BOM is allowed
// and ignored, §6), RFC 8259 §6 (JSON numbers: no NaN/Infinity), OWASP "CSV Injection" (formula
// prefixes = + - @ tab CR), OWASP XSS / SQL injection prevention cheat sheets (text stays text).

let t: TestApp;
let s: SeededStudy;
let inert: SeededStudy;
let eng: Client;
const tally = new Map<string, { checks: number; passed: boolean }>();

beforeAll(async () => {
  t = await startTestApp();
  s = seedStudy(t.ctx, { title: 'Bad input target' });
  inert = seedStudy(t.ctx, { title: 'Inert text target' });
  eng = await signIn(t.app, 'engineer');
  await eng.prime();
});
afterAll(async () => {
  const passed = [...tally.values()].filter((c) => c.passed).length;
  const checks = [...tally.values()].reduce((a, c) => a + c.checks, 0);
  console.log(`bad-input classes: ${tally.size} tried, ${passed} passed (${checks} checks)`);
  for (const [cls, c] of tally) console.log(`  ${c.passed ? 'PASS' : 'FAIL'}  ${cls} (${c.checks} checks)`);
  await t.close();
});

/** Runs one class; counts its checks and records pass/fail for the summary. */
async function badClass(name: string, body: (check: () => void) => Promise<void>): Promise<void> {
  const entry = { checks: 0, passed: false };
  tally.set(name, entry);
  await body(() => entry.checks++);
  entry.passed = true;
}

const fp = () => studyFingerprint(t.ctx, s.studyId);
const H = () => s.runs.map((r) => r.code);

function upload(buf: Buffer | string, name: string, studyId = s.studyId) {
  return eng.agent.post(`/api/studies/${studyId}/imports`).set('X-XSRF-TOKEN', eng.xsrf).attach('file', Buffer.isBuffer(buf) ? buf : Buffer.from(buf), name);
}

/** A refused import: either the upload is a 4xx, or the preview lists the error and the commit is 409. */
async function importRefused(buf: Buffer | string, name: string, expected: RegExp): Promise<void> {
  const before = fp();
  const res = await upload(buf, name);
  if (res.status >= 400 && res.status < 500) {
    expect(res.body.message).toMatch(expected);
  } else {
    expect(res.status).toBe(201);
    const messages = (res.body.import.errors as { message: string }[]).map((e) => e.message).join(' | ');
    expect(messages).toMatch(expected);
    const commit = await eng.post(`/api/studies/${s.studyId}/imports/${res.body.import.id}/commit`);
    expect(commit.status).toBe(409);
  }
  expect(fp()).toBe(before);
}

async function jsonRefused(method: 'patch' | 'post', url: string, body: unknown, status: number, expected: RegExp): Promise<void> {
  const before = fp();
  const res = await eng[method](url, body);
  expect(res.status).toBe(status);
  expect(res.body.message).toMatch(expected);
  expect(fp()).toBe(before);
}

async function queryRefused(url: string, expected: RegExp): Promise<void> {
  const before = fp();
  const res = await eng.get(url);
  expect(res.status).toBe(400);
  expect(res.body.message).toMatch(expected);
  expect(fp()).toBe(before);
}

const HEAD = ['Run', 'H', 'r', 'Notes'];
const run1 = () => s.runs[0]!;
const patchUrl = () => `/api/studies/${s.studyId}/runs/${run1().id}`;
const pushUrl = () => `/api/studies/${s.studyId}/results`;

describe('bad input changes nothing and says what is wrong', () => {
  it('wrong encoding / BOM', async () => {
    await badClass('wrong encoding / BOM', async (check) => {
      await importRefused(Buffer.from(`Run,H,Notes\n${H()[0]},0.5,d\xe9j\xe0 vu\n`, 'latin1'), 'latin1.csv', /not UTF-8/); check();
      await importRefused(Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('Run,H\nR1,1\n', 'utf16le')]), 'utf16.csv', /not UTF-8/); check();
      // A UTF-8 BOM is legal (RFC 3629 §6) and must not end up in the first header.
      const bom = await upload(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(csv([HEAD, [H()[0]!, '0.5', '1.1', '']]))]), 'bom.csv');
      expect(bom.status).toBe(201);
      expect(bom.body.import.headers[0]).toBe('Run');
      expect(bom.body.import.errors).toEqual([]); check();
    });
  });

  it('empty file', async () => {
    await badClass('empty file', async (check) => {
      await importRefused('', 'empty.csv', /empty/); check();
      await importRefused(Buffer.alloc(0), 'empty.xlsx', /empty/); check();
      const before = fp();
      const att = await eng.agent.post(`/api/studies/${s.studyId}/runs/${run1().id}/attachments`).set('X-XSRF-TOKEN', eng.xsrf).attach('file', Buffer.alloc(0), 'empty.csv');
      expect(att.status, JSON.stringify(att.body)).toBeGreaterThanOrEqual(400);
      expect(att.status).toBeLessThan(500);
      expect(fp()).toBe(before); check();
    });
  });

  it('header only', async () => {
    await badClass('header only', async (check) => {
      await importRefused(csv([HEAD]), 'header.csv', /no data rows/); check();
      await importRefused(await xlsx([HEAD]), 'header.xlsx', /no data rows/); check();
    });
  });

  it('wrong delimiter', async () => {
    await badClass('wrong delimiter', async (check) => {
      // Colon-separated: everything lands in one column, so no row can find its run.
      await importRefused(`Run:H:r\n${H()[0]}:0.5:1.1\n${H()[1]}:0.6:1.2\n`, 'colon.csv', /Map a column to the run id/); check();
    });
  });

  it('NaN / Infinity / 1e309 / "1,5"', async () => {
    await badClass('NaN / Infinity / 1e309 / "1,5"', async (check) => {
      for (const [i, v] of ['NaN', 'Infinity', '1e309', '1,5'].entries()) {
        await importRefused(csv([HEAD, [H()[i]!, v, '1', '']]), `num-${i}.csv`, new RegExp(`H: "${v}" is not a number`)); check();
        await importRefused(await xlsx([HEAD, [H()[i]!, v, 1, '']]), `num-${i}.xlsx`, new RegExp(`H: "${v}" is not a number`)); check();
        await jsonRefused('patch', patchUrl(), { version: 1, values: { H: v } }, 400, new RegExp(`"${v}"`)); check();
      }
      // RFC 8259 has no NaN/Infinity; 1e309 parses to Infinity in JavaScript and must not be stored.
      const before = fp();
      const raw = await eng.agent.post(pushUrl()).set('X-XSRF-TOKEN', eng.xsrf).set('Idempotency-Key', 'bad-input-0001').set('content-type', 'application/json').send(`[{"runId":${run1().id},"values":{"H":1e309}}]`);
      expect(raw.status).toBe(400);
      expect(raw.body.message).toMatch(/Infinity/);
      const nan = await eng.agent.post(pushUrl()).set('X-XSRF-TOKEN', eng.xsrf).set('Idempotency-Key', 'bad-input-0002').set('content-type', 'application/json').send(`[{"runId":${run1().id},"values":{"H":NaN}}]`);
      expect(nan.status).toBe(400);
      expect(nan.body.message).toMatch(/not valid JSON/);
      expect(fp()).toBe(before); check();
      await queryRefused(`/api/studies/${s.studyId}/audit?limit=1e309`, /limit/); check();
      await queryRefused(`/api/studies/${s.studyId}/audit?limit=NaN`, /limit/); check();
    });
  });

  it('50 MB file', async () => {
    await badClass('50 MB file', async (check) => {
      const big = Buffer.alloc(50 * 1024 * 1024, 'R001,0.5,1.1,x\n');
      const before = fp();
      const imp = await upload(big, 'big.csv');
      expect(imp.status).toBe(413);
      expect(imp.body.message).toMatch(/upload limit/); check();
      const att = await eng.agent.post(`/api/studies/${s.studyId}/runs/${run1().id}/attachments`).set('X-XSRF-TOKEN', eng.xsrf).attach('file', big, 'big.csv');
      expect(att.status).toBe(413); check();
      const json = await eng.agent.post(pushUrl()).set('X-XSRF-TOKEN', eng.xsrf).set('content-type', 'application/json').send(`[{"notes":"${'x'.repeat(50 * 1024 * 1024)}"}]`);
      expect(json.status).toBe(413);
      expect(json.body.message).toMatch(/larger than the limit/); check();
      expect(fp()).toBe(before);
    });
  });

  it('zip-bomb XLSX', async () => {
    await badClass('zip-bomb XLSX', async (check) => {
      await importRefused(zipBombXlsx(), 'bomb.xlsx', /zip bomb|unpacks to more than/); check();
      await importRefused(Buffer.from('PK\x03\x04 not really a zip'), 'fake.xlsx', /not a readable/); check();
    });
  });

  it('formula injection', async () => {
    await badClass('formula injection', async (check) => {
      // In a number column a formula is simply not a number.
      await importRefused(csv([HEAD, [H()[0]!, '=1+1', '1', '']]), 'formula.csv', /"=1\+1" is not a number/); check();
      await jsonRefused('patch', patchUrl(), { version: 1, values: { H: '=SUM(A1:A9)' } }, 400, /"=SUM\(A1:A9\)" is not a number/); check();
      // In a text column it is stored as typed and neutralised in every export.
      const r = inert.runs[0]!;
      const payload = '=HYPERLINK("http://example.invalid","x")';
      const res = await eng.patch(`/api/studies/${inert.studyId}/runs/${r.id}`, { version: 1, notes: payload });
      expect(res.status).toBe(200);
      expect(res.body.run.notes).toBe(payload);
      const out = await eng.get(`/api/studies/${inert.studyId}/export?format=csv`);
      expect(out.text).toContain(`"'=HYPERLINK(""http://example.invalid"",""x"")"`);
      expect(out.text).not.toMatch(/(^|,)"?=HYPERLINK/m); check();
    });
  });

  it('duplicate run ids', async () => {
    await badClass('duplicate run ids', async (check) => {
      await importRefused(csv([HEAD, [H()[0]!, '0.5', '1', ''], [H()[0]!, '0.6', '1', '']]), 'dup.csv', /already appears in row 1/); check();
      const before = fp();
      const push = await eng.agent.post(pushUrl()).set('X-XSRF-TOKEN', eng.xsrf).set('Idempotency-Key', 'bad-input-0003').send([{ runId: run1().id, values: { H: '1' } }, { runId: run1().code, values: { H: '2' } }]);
      expect(push.status).toBe(400);
      expect(push.body.message).toMatch(/edited twice/);
      const batch = await eng.post(`/api/studies/${s.studyId}/runs/batch`, { edits: [{ runId: run1().id, version: 1, values: { H: '1' } }, { runId: run1().id, version: 1, values: { r: '1' } }] });
      expect(batch.status).toBe(400);
      expect(fp()).toBe(before); check();
    });
  });

  it('unknown levels', async () => {
    await badClass('unknown levels', async (check) => {
      await importRefused(csv([['W', 'A', 'H'], ['0.6', '30', '1']]), 'level.csv', /"0.6" is not a level of W/); check();
      await jsonRefused('post', pushUrl(), { idempotencyKey: 'bad-input-0004', results: [{ settings: { W: '0.5', A: '90' }, values: { H: '1' } }] }, 400, /"90" is not a level of A/); check();
    });
  });

  it('missing columns', async () => {
    await badClass('missing columns', async (check) => {
      await importRefused(csv([['W', 'H'], ['0.5', '1']]), 'missing.csv', /Map a column to the run id, or map every factor/); check();
      const res = await upload(csv([HEAD, [H()[0]!, '1', '1', '']]), 'ok.csv');
      const remap = await eng.put(`/api/studies/${s.studyId}/imports/${res.body.import.id}/mapping`, { columns: { Run: 'run', Height: 'response:H' } });
      expect((remap.body.import.errors as { message: string }[]).map((e) => e.message).join()).toMatch(/"Height", which is not in the file/);
      const before = fp();
      expect((await eng.post(`/api/studies/${s.studyId}/imports/${res.body.import.id}/commit`)).status).toBe(409);
      expect(fp()).toBe(before); check();
    });
  });

  it('extra columns', async () => {
    await badClass('extra columns', async (check) => {
      // A column the mapping sends nowhere real is refused ...
      const res = await upload(csv([['Run', 'H', 'Q'], [H()[0]!, '1', '2']]), 'extra.csv');
      const remap = await eng.put(`/api/studies/${s.studyId}/imports/${res.body.import.id}/mapping`, { columns: { Run: 'run', H: 'response:H', Q: 'response:Q' } });
      expect((remap.body.import.errors as { message: string }[]).map((e) => e.message).join()).toMatch(/No response "Q"/);
      const before = fp();
      expect((await eng.post(`/api/studies/${s.studyId}/imports/${res.body.import.id}/commit`)).status).toBe(409);
      expect(fp()).toBe(before); check();
      // ... an unmapped one is shown as ignored in the preview, and JSON bodies refuse unknown fields.
      const auto = await upload(csv([['Run', 'H', 'Colour'], [H()[0]!, '1', 'red']]), 'extra2.csv');
      expect(auto.body.import.mapping.columns.Colour).toBe('ignore'); check();
      await jsonRefused('post', pushUrl(), { idempotencyKey: 'bad-input-0005', results: [{ runId: run1().id, values: { H: '1' }, colour: 'red' }] }, 400, /colour/); check();
    });
  });

  it('over-long strings', async () => {
    await badClass('over-long strings', async (check) => {
      const long = 'x'.repeat(5000);
      await importRefused(csv([HEAD, [H()[0]!, '1', '1', long]]), 'long.csv', /notes: 5000 characters is too long/); check();
      await jsonRefused('patch', patchUrl(), { version: 1, notes: long }, 400, /at most 4000 characters/); check();
      await jsonRefused('patch', patchUrl(), { version: 1, values: { H: '1'.repeat(65) } }, 400, /at most 64 characters/); check();
      await queryRefused(`/api/studies?q=${'q'.repeat(300)}`, /q/); check();
      const hugeName = await eng.agent.post(`/api/studies/${s.studyId}/imports`).set('X-XSRF-TOKEN', eng.xsrf).attach('file', Buffer.from(csv([HEAD])), `${'n'.repeat(300)}.csv`);
      expect(hugeName.status).toBeGreaterThanOrEqual(400);
      expect(hugeName.status).toBeLessThan(500); check();
    });
  });

  it('query strings out of their domain', async () => {
    await badClass('bad query strings', async (check) => {
      await queryRefused('/api/studies?status=bogus', /status/); check();
      await queryRefused('/api/studies?sort=1;drop', /sort/); check();
      await queryRefused(`/api/studies/${s.studyId}/export?format=pdf`, /format must be csv, xlsx or html/); check();
      await queryRefused(`/api/studies/${s.studyId}/runs?includeRemoved=maybe`, /includeRemoved/); check();
      const notNumber = await eng.get('/api/studies/abc');
      expect(notNumber.status).toBe(404); check();
    });
  });

  it('SQL-looking text is stored and shown inert', async () => {
    await badClass('SQL-looking text', async (check) => {
      const sqlText = "R001'); DROP TABLE runs; --";
      const found = await eng.get(`/api/studies?q=${encodeURIComponent("' OR 1=1 --")}`);
      expect(found.status).toBe(200);
      expect(found.body.studies).toEqual([]); check();
      const r = inert.runs[1]!;
      const runCount = () => (t.ctx.db.$client.prepare('select count(*) as n from runs').get() as { n: number }).n;
      const runsBefore = runCount();
      const res = await eng.patch(`/api/studies/${inert.studyId}/runs/${r.id}`, { version: 1, notes: sqlText, operator: "x' OR '1'='1" });
      expect(res.status).toBe(200);
      const row = t.ctx.db.$client.prepare('select notes, operator from runs where id = ?').get(r.id) as { notes: string; operator: string };
      expect(row).toEqual({ notes: sqlText, operator: "x' OR '1'='1" });
      expect(runCount()).toBe(runsBefore); check();
      await importRefused(csv([HEAD, [sqlText, '1', '1', '']]), 'sql.csv', /is not in this study's plan/); check();
    });
  });

  it('HTML-looking text is stored and shown inert', async () => {
    await badClass('HTML-looking text', async (check) => {
      const html = '<img src=x onerror=alert(1)><script>alert(2)</script>';
      const r = inert.runs[2]!;
      const res = await eng.patch(`/api/studies/${inert.studyId}/runs/${r.id}`, { version: 1, notes: html });
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toMatch(/^application\/json/);
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(res.body.run.notes).toBe(html); check();
      const sheet = await eng.get(`/api/studies/${inert.studyId}/export?format=html`);
      expect(sheet.status).toBe(200);
      expect(sheet.text).not.toContain('<script>alert(2)');
      expect(sheet.text).not.toContain('<img src=x');
      expect(sheet.text).toContain('&lt;script&gt;'); check();
      expect(sheet.headers['content-security-policy']).toContain("script-src 'self'"); check();
      const title = await eng.post('/api/studies', { title: html });
      expect(title.status).toBe(201);
      expect(title.body.study.title).toBe(html); check();
      const stranger = await request(t.app).get(`/api/studies/${inert.studyId}/export?format=html`);
      expect(stranger.status).toBe(401); check();
    });
  });
});
