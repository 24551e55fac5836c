import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { makeStudy } from './study-fixtures.js';

// Import rules (docs/api-studies.md): preview before writing, row-level errors, commit all-or-nothing.
// Expected values are the file contents echoed back: common practice, no source.

let t: TestApp;
let engineer: Client;
let supervisor: Client;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  supervisor = await signIn(t.app, 'supervisor');
});
afterAll(() => t.close());

/**
 * A multipart POST with the XSRF header. Built synchronously: a supertest request is a thenable, so
 * returning it from an async function would send it before the file is attached. Signed-in clients
 * already hold the XSRF token from the sign-in response.
 */
export function multipart(client: Client, url: string) {
  return client.agent.post(url).set('X-XSRF-TOKEN', client.xsrf);
}

async function upload(client: Client, studyId: number, name: string, content: string | Buffer, mapping?: object) {
  let req = (multipart(client, `/api/studies/${studyId}/imports`)).attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content, 'utf8'), name);
  if (mapping) req = req.field('mapping', JSON.stringify(mapping));
  return req;
}

function countValues(studyId: number): number {
  return (t.ctx.db.$client.prepare('select count(*) as n from run_values v join runs r on r.id = v.run_id where r.study_id = ?').get(studyId) as { n: number }).n;
}
function countAudit(studyId: number): number {
  return (t.ctx.db.$client.prepare('select count(*) as n from audit_events where study_id = ?').get(studyId) as { n: number }).n;
}

describe('CSV import by run id', () => {
  it('previews without writing, then commits every row in one go', async () => {
    const { id } = makeStudy(t);
    const csv = 'Run,H,ang [deg],Outcome,Notes\nR001,0.850,31.5,valid,first\nR002,0.61,-2,brittle fracture,cracked\n';
    const res = await upload(engineer, id, 'bench.csv', csv);
    expect(res.status).toBe(201);
    const imp = res.body.import;
    expect(imp).toMatchObject({ rowCount: 2, errorCount: 0, status: 'preview', errors: [] });
    expect(imp.mapping.columns).toEqual({ Run: 'run', H: 'response:H', 'ang [deg]': 'response:ang', Outcome: 'outcome', Notes: 'notes' });
    expect(countValues(id)).toBe(0);
    const commit = await engineer.post(`/api/studies/${id}/imports/${imp.id}/commit`);
    expect(commit.status).toBe(200);
    expect(commit.body.changed).toEqual({ runs: 2, values: 8 });
    const runs = (await engineer.get(`/api/studies/${id}/runs`)).body.runs;
    expect(runs[0].values.H).toEqual({ text: '0.850', value: 0.85, outOfRange: false });
    expect(runs[1]).toMatchObject({ excluded: true, notes: 'cracked' });
    const again = await engineer.post(`/api/studies/${id}/imports/${imp.id}/commit`);
    expect(again.status).toBe(409);
    const audit = (await engineer.get(`/api/studies/${id}/audit?entity=import&action=commit`)).body.events;
    expect(JSON.parse(audit[0].newValue)).toMatchObject({ file: 'bench.csv', rows: 2, runs: 2 });
  });

  it('reports row-level errors and writes nothing when one row is bad; the fixed file then commits', async () => {
    const { id } = makeStudy(t);
    const bad = 'run,A,B,H\nR001,0.5,round,0.41\nR002,0.8,round,0.42\nR003,0.5,vee,O.43\nR004,0.8,vee,0.44\nR004,0.8,vee,0.45\nR999,0.5,round,0.1\nR005,0.5,hex,0.2\nR006,0.5,flat,0.3\n';
    const res = await upload(engineer, id, 'bad.csv', bad);
    expect(res.status).toBe(201);
    const errors = res.body.import.errors.map((e: { row: number; kind: string }) => [e.row, e.kind]);
    // R003 "O.43" (letter O); R004 twice; R999 unknown; "hex" not a level of B; R006 was planned at A=0.8
    expect(errors).toEqual([[3, 'non-numeric'], [5, 'duplicate-run'], [6, 'unmatched-run'], [7, 'unknown-level'], [8, 'unmatched-run']]);
    expect(res.body.import.errors[0].message).toBe('H: "O.43" is not a number');
    expect(res.body.import.errors[3].message).toBe('"hex" is not a level of B (levels: round, vee, flat)');
    const before = countAudit(id);
    const commit = await engineer.post(`/api/studies/${id}/imports/${res.body.import.id}/commit`);
    expect(commit.status).toBe(409);
    expect(commit.body.message).toMatch(/still has 5 row errors; nothing was written/);
    expect(countValues(id)).toBe(0);
    expect(countAudit(id)).toBe(before);
    const fixed = await upload(engineer, id, 'fixed.csv', 'run,A,B,H\nR001,0.5,round,0.41\nR002,0.8,round,0.42\nR003,0.5,vee,0.43\n');
    expect(fixed.body.import.errorCount).toBe(0);
    expect((await engineer.post(`/api/studies/${id}/imports/${fixed.body.import.id}/commit`)).status).toBe(200);
    expect(countValues(id)).toBe(3);
  });

  it('re-checks at commit time: a run recorded since the preview makes a settings-matched import fail', async () => {
    const { id, runIds } = makeStudy(t, { replicates: 1 });
    const res = await upload(engineer, id, 'by-settings.csv', 'A;B;H\n0.5;round;0.7\n');
    expect(res.body.import.errorCount).toBe(0);
    await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, values: { H: '0.69' } });
    const commit = await engineer.post(`/api/studies/${id}/imports/${res.body.import.id}/commit`);
    expect(commit.status).toBe(409);
    expect(commit.body.current.errors[0]).toMatchObject({ row: 1, kind: 'duplicate-run' });
  });
});

describe('matching by factor settings, mapping, XLSX', () => {
  it('fills replicates in run order and reports unmatched settings', async () => {
    const { id } = makeStudy(t);
    const csv = 'A,B,H\n0.50,round,0.1\n0.5,round,0.2\n0.5,round,0.3\n0.8,flat,0.4\n';
    const res = await upload(engineer, id, 'settings.csv', csv);
    // 2 replicates per cell: the third "0.5, round" row has no free run left.
    expect(res.body.import.errors).toEqual([{ row: 3, column: null, kind: 'duplicate-run', message: 'More rows than unrecorded runs for the settings A=0.5, B=round' }]);
    expect(res.body.import.sample.map((s: { runCode: string }) => s.runCode)).toEqual(['R001', 'R007', 'R006']);
  });

  it('takes an explicit mapping and can be re-mapped without a new upload', async () => {
    const { id } = makeStudy(t);
    const csv = 'Specimen no.,Hill coefficient,who\nR001,0.5,Kim\n';
    const auto = await upload(engineer, id, 'm.csv', csv);
    expect(auto.body.import.errors[0]).toMatchObject({ kind: 'missing-key' });
    const remap = await engineer.put(`/api/studies/${id}/imports/${auto.body.import.id}/mapping`, { columns: { 'Specimen no.': 'run', 'Hill coefficient': 'response:H', who: 'operator' } });
    expect(remap.status).toBe(200);
    expect(remap.body.import.errorCount).toBe(0);
    expect((await engineer.put(`/api/studies/${id}/imports/${auto.body.import.id}/mapping`, { columns: { x: 'response:' } })).status).toBe(400);
    const withField = await upload(engineer, id, 'm.csv', csv, { columns: { 'Specimen no.': 'run', 'Hill coefficient': 'response:Q' } });
    expect(withField.body.import.errors[0].message).toBe('No response "Q" in this study');
    const commit = await engineer.post(`/api/studies/${id}/imports/${auto.body.import.id}/commit`);
    expect(commit.status).toBe(200);
    expect((await engineer.get(`/api/studies/${id}/runs`)).body.runs[0].operator).toBe('Kim');
  });

  it('imports the first sheet of an XLSX workbook', async () => {
    const { id } = makeStudy(t);
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('results');
    ws.addRow(['run', 'H', 'tested on']);
    ws.addRow(['R001', 0.75, new Date(Date.UTC(2026, 2, 14))]);
    ws.addRow(['R002', 'n/a', null]);
    const buf = Buffer.from(await wb.xlsx.writeBuffer());
    const res = await upload(engineer, id, 'results.xlsx', buf);
    expect(res.status).toBe(201);
    expect(res.body.import.errors).toEqual([{ row: 2, column: 'H', kind: 'non-numeric', message: 'H: "n/a" is not a number' }]);
    expect(res.body.import.sample[0].changes).toMatchObject({ values: { H: '0.75' }, testedOn: '2026-03-14' });
  });
});

describe('refusals', () => {
  it('refuses empty, header-only, non-UTF-8 files and viewers', async () => {
    const { id } = makeStudy(t);
    expect((await upload(engineer, id, 'empty.csv', '')).body.message).toMatch(/is empty/);
    expect((await upload(engineer, id, 'head.csv', 'run,H\n')).body.message).toMatch(/has a header but no data rows/);
    const latin1 = Buffer.from([0x72, 0x75, 0x6e, 0x2c, 0x4e, 0xf6, 0x74, 0x65, 0x0a, 0x52, 0x30, 0x30, 0x31, 0x2c, 0xe9, 0x0a]);
    const enc = await upload(engineer, id, 'latin1.csv', latin1);
    expect(enc.status).toBe(400);
    expect(enc.body.message).toMatch(/not UTF-8/);
    expect((await upload(engineer, id, 'x.xlsx', Buffer.from('PK not really a zip'))).body.message).toMatch(/not a readable (ZIP\/)?XLSX/);
    expect((await multipart(engineer, `/api/studies/${id}/imports`).field('x', '1')).body.message).toMatch(/form field "file"/);
    expect((await upload(supervisor, id, 'bench.csv', 'run,H\nR001,1\n')).status).toBe(403);
    const ok = await upload(engineer, id, 'bench.csv', 'run,H\nR001,1\n');
    expect((await supervisor.get(`/api/studies/${id}/imports/${ok.body.import.id}`)).status).toBe(200);
    expect((await engineer.delete(`/api/studies/${id}/imports/${ok.body.import.id}`)).body.import.status).toBe('discarded');
    expect((await engineer.post(`/api/studies/${id}/imports/${ok.body.import.id}/commit`)).status).toBe(409);
  });
});
