import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { makeStudy } from './study-fixtures.js';

// The audit trail records who, when, old, new and why for every change (issue 4); the expected rows
// are the edits made in the test: common practice, no source.

let t: TestApp;
let engineer: Client;
let statistician: Client;
let study: { id: number; runIds: number[] };
let started = 0;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  statistician = await signIn(t.app, 'statistician');
  study = makeStudy(t);
  started = Date.now();
  await engineer.patch(`/api/studies/${study.id}/runs/${study.runIds[0]}`, { version: 1, values: { H: '0.5' } });
  await engineer.patch(`/api/studies/${study.id}/runs/${study.runIds[0]}`, { version: 2, values: { H: '0.55' }, reason: 'transcription error' });
  await engineer.patch(`/api/studies/${study.id}/runs/${study.runIds[1]}`, { version: 1, notes: '=1+1' });
  await engineer.patch(`/api/studies/${study.id}`, { purpose: 'Find the neck width that gives the least scatter' });
});
afterAll(() => t.close());

describe('study audit', () => {
  it('lists changes newest first for any member, with who, old, new and reason', async () => {
    const res = await statistician.get(`/api/studies/${study.id}/audit?entity=run`);
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(3);
    expect(res.body.events.map((e: { field: string; oldValue: string | null; newValue: string }) => [e.field, e.oldValue, e.newValue])).toEqual([
      ['notes', '', '=1+1'],
      ['value:H', '0.5', '0.55'],
      ['value:H', null, '0.5'],
    ]);
    expect(res.body.events[1]).toMatchObject({ reason: 'transcription error', user: { name: 'Elin Engineer' }, runCode: 'R001', action: 'sheet' });
  });

  it('filters by run, field, user, time window and pages', async () => {
    const byRun = (await engineer.get(`/api/studies/${study.id}/audit?runId=${study.runIds[1]}`)).body;
    expect(byRun.events.map((e: { field: string }) => e.field)).toEqual(['notes']);
    expect((await engineer.get(`/api/studies/${study.id}/audit?field=purpose`)).body.total).toBe(1);
    const engineerId = byRun.events[0].user.id;
    expect((await engineer.get(`/api/studies/${study.id}/audit?userId=${engineerId}&entity=run`)).body.total).toBe(3);
    expect((await engineer.get(`/api/studies/${study.id}/audit?from=${started}&entity=run`)).body.total).toBe(3);
    expect((await engineer.get(`/api/studies/${study.id}/audit?to=2000-01-01`)).body.total).toBe(0);
    const page = (await engineer.get(`/api/studies/${study.id}/audit?entity=run&limit=1&offset=1`)).body;
    expect(page.events).toHaveLength(1);
    expect(page.events[0].newValue).toBe('0.55');
    const bad = await engineer.get(`/api/studies/${study.id}/audit?from=yesterday`);
    expect(bad.status).toBe(400);
    expect(bad.body.message).toMatch(/from: "yesterday" is neither an ISO date\/time nor epoch milliseconds/);
    expect((await engineer.get(`/api/studies/${study.id}/audit?limit=0`)).status).toBe(400);
  });

  it('exports CSV with the formula guard', async () => {
    const res = await engineer.get(`/api/studies/${study.id}/audit?format=csv&entity=run`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const rows = Papa.parse<string[]>(res.text.replace(/^\ufeff/, ''), { skipEmptyLines: true }).data;
    expect(rows[0]).toEqual(['at (UTC)', 'user', 'entity', 'entity id', 'run', 'action', 'field', 'old value', 'new value', 'reason', 'via token']);
    expect(rows).toHaveLength(4);
    // OWASP CSV injection guidance: a leading apostrophe keeps "=1+1" as text
    expect(rows[1]![8]).toBe("'=1+1");
    expect(rows[2]!.slice(6, 10)).toEqual(['value:H', '0.5', '0.55', 'transcription error']);
  });

  it('is hidden from non-members', async () => {
    const other = makeStudy(t, { members: false });
    expect((await statistician.get(`/api/studies/${other.id}/audit`)).status).toBe(404);
  });
});
