import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { makeStudy } from './study-fixtures.js';

// Formula injection: a spreadsheet runs a text cell starting with = + - @ (or tab / CR) as a formula;
// the guard is a leading apostrophe (OWASP "CSV Injection" page). Plain numbers stay numbers.

let t: TestApp;
let engineer: Client;
let supervisor: Client;
let study: { id: number; runIds: number[] };

const HOSTILE = ['=HYPERLINK("http://x.test","click")', '+1+1', '-2+3', '@SUM(A1:A2)', '\t=1+2', '\r=1+2'];

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  supervisor = await signIn(t.app, 'supervisor');
  study = makeStudy(t, { title: 'Export <study>' });
  const edits = HOSTILE.map((notes, i) => ({ runId: study.runIds[i]!, version: 1, notes, values: { H: '0.850', ang: '-12.5' } }));
  const res = await engineer.post(`/api/studies/${study.id}/runs/batch`, { edits: [...edits, { runId: study.runIds[6]!, version: 1, operator: '=cmd|"/c calc"!A1', notes: '<script>alert(1)</script>' }] });
  expect(res.status).toBe(200);
});
afterAll(() => t.close());

describe('run sheet export', () => {
  it('CSV: hostile text gets a leading apostrophe, decimals stay as typed', async () => {
    const res = await supervisor.get(`/api/studies/${study.id}/export?format=csv`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?Export-study-\d+-runs.csv"?$/);
    expect(res.text.charCodeAt(0)).toBe(0xfeff);
    const rows = Papa.parse<string[]>(res.text.slice(1), { skipEmptyLines: true }).data;
    const header = rows[0]!;
    const notes = header.indexOf('notes');
    expect(rows.slice(1, 7).map((r) => r[notes])).toEqual(HOSTILE.map((h) => `'${h}`));
    expect(rows[7]![header.indexOf('operator')]).toBe('\'=cmd|"/c calc"!A1');
    expect(rows[1]![header.indexOf('H')]).toBe('0.850');
    expect(rows[1]![header.indexOf('ang [deg]')]).toBe('-12.5');
    expect(rows).toHaveLength(13);
  });

  it('XLSX: same guard in text cells, numbers as numbers', async () => {
    const res = await engineer.agent.get(`/api/studies/${study.id}/export?format=xlsx`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(res.status).toBe(200);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(res.body as ArrayBuffer);
    const ws = wb.worksheets[0]!;
    const header = (ws.getRow(1).values as unknown[]).slice(1);
    const col = (name: string) => header.indexOf(name) + 1;
    expect(ws.getRow(2).getCell(col('notes')).value).toBe(`'${HOSTILE[0]}`);
    expect(ws.getRow(4).getCell(col('notes')).value).toBe(`'${HOSTILE[2]}`);
    expect(ws.getRow(2).getCell(col('H')).value).toBe(0.85);
    expect(ws.getRow(2).getCell(col('A')).value).toBe(0.5);
    expect(ws.getRow(2).getCell(col('ang [deg]')).value).toBe(-12.5);
  });

  it('HTML bench sheet: escaped, printable, one row per run', async () => {
    const res = await engineer.get(`/api/studies/${study.id}/export?format=html`);
    expect(res.status).toBe(200);
    expect(res.text).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(res.text).not.toContain('<script>');
    expect(res.text).toContain('Export &lt;study&gt;');
    expect(res.text.match(/<tr>/g)).toHaveLength(13);
  });

  it('refuses unknown formats and non-members', async () => {
    const bad = await engineer.get(`/api/studies/${study.id}/export?format=pdf`);
    expect(bad.status).toBe(400);
    expect(bad.body.message).toMatch(/format must be csv, xlsx or html/);
    const other = makeStudy(t, { members: false });
    expect((await supervisor.get(`/api/studies/${other.id}/export`)).status).toBe(404);
  });
});
