import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { studies } from '../../server/db/schema.js';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { makeStudy } from './study-fixtures.js';

// Rules of the run sheet (docs/api-studies.md); the expected values are the inputs echoed back or the
// product's own rules: common practice, no source.

let t: TestApp;
let engineer: Client;
let statistician: Client;
let supervisor: Client;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  statistician = await signIn(t.app, 'statistician');
  supervisor = await signIn(t.app, 'supervisor');
});
afterAll(() => t.close());

interface SheetRun { id: number; code: string; version: number; values: Record<string, { text: string; value: number; outOfRange: boolean }>; excluded: boolean; measured: Record<string, { text: string; value: number }>; removedAt: number | null; notes: string }
async function sheet(id: number, query = ''): Promise<{ runs: SheetRun[]; counts: Record<string, number>; outcomes: { id: number; valid: boolean }[] }> {
  return (await engineer.get(`/api/studies/${id}/runs${query}`)).body;
}

describe('GET runs', () => {
  it('returns settings, set-up and counts to every member', async () => {
    const { id } = makeStudy(t);
    const res = await supervisor.get(`/api/studies/${id}/runs`);
    expect(res.status).toBe(200);
    expect(res.body.runs).toHaveLength(12);
    expect(res.body.runs[0]).toMatchObject({ code: 'R001', settings: { A: '0.5', B: 'round' }, values: {}, excluded: false, version: 1, attachmentCount: 0 });
    expect(res.body.counts).toEqual({ planned: 12, recorded: 0, invalid: 0, removed: 0 });
    expect(res.body.responses.map((r: { symbol: string }) => r.symbol)).toEqual(['H', 'ang']);
  });
});

describe('PATCH a run cell', () => {
  it('keeps the text as typed beside the number, bumps the version and audits old/new', async () => {
    const { id, runIds } = makeStudy(t);
    const res = await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, values: { H: '0.850' } });
    expect(res.status).toBe(200);
    expect(res.body.run.values.H).toEqual({ text: '0.850', value: 0.85, outOfRange: false });
    expect(res.body.run.version).toBe(2);
    expect(res.body.changes).toEqual([{ runId: runIds[0], code: 'R001', field: 'value:H', oldValue: null, newValue: '0.850' }]);
    await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 2, values: { H: '0.86' }, reason: 'misread dial' });
    const history = (await engineer.get(`/api/studies/${id}/runs/${runIds[0]}/history`)).body.events;
    expect(history.map((e: { oldValue: string | null; newValue: string }) => [e.oldValue, e.newValue])).toEqual([['0.850', '0.86'], [null, '0.850']]);
    expect(history[0]).toMatchObject({ reason: 'misread dial', user: { name: 'Elin Engineer' }, runCode: 'R001' });
  });

  it('answers a stale version with 409 and the current run, writing nothing', async () => {
    const { id, runIds } = makeStudy(t);
    await engineer.patch(`/api/studies/${id}/runs/${runIds[1]}`, { version: 1, values: { H: '0.51' } });
    const stale = await engineer.patch(`/api/studies/${id}/runs/${runIds[1]}`, { version: 1, values: { H: '0.99' } });
    expect(stale.status).toBe(409);
    expect(stale.body.current).toMatchObject({ id: runIds[1], version: 2, values: { H: { text: '0.51' } } });
    expect((await sheet(id)).runs[1]!.values.H!.text).toBe('0.51');
  });

  it('refuses non-numbers with a message naming the cell, and unknown symbols', async () => {
    const { id, runIds } = makeStudy(t);
    const comma = await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, values: { H: '1,5' } });
    expect(comma.status).toBe(400);
    expect(comma.body.message).toBe('values.H: H: "1,5" uses a comma; use a point as the decimal mark');
    const huge = await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, values: { H: '1e309' } });
    expect(huge.body.message).toMatch(/too large to be a finite number/);
    const unknown = await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, values: { Q: '1' } });
    expect(unknown.body.details).toEqual([{ path: 'values.Q', message: 'No response with symbol "Q"' }]);
    expect((await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { values: { H: '1' } })).body.message).toMatch(/version is required/);
    expect((await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, testedOn: '14.3.2026' })).body.message).toMatch(/testedOn must be a date/);
  });

  it('flags out-of-range values without refusing them', async () => {
    const { id, runIds } = makeStudy(t);
    const res = await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, values: { H: '2.5' } });
    expect(res.status).toBe(200);
    expect(res.body.run.values.H.outOfRange).toBe(true);
    expect(res.body.warnings[0]).toMatch(/outside the plausible range 0 … 2/);
  });

  it('marks runs with an invalid outcome as excluded and counts them', async () => {
    const { id, runIds } = makeStudy(t);
    const brittle = (await sheet(id)).outcomes.find((o) => !o.valid)!.id;
    const res = await engineer.patch(`/api/studies/${id}/runs/${runIds[2]}`, { version: 1, outcomeId: brittle, outcomeReason: 'crack from the notch root' });
    expect(res.body.run).toMatchObject({ excluded: true, outcomeReason: 'crack from the notch root' });
    expect((await sheet(id)).counts.invalid).toBe(1);
    expect((await engineer.patch(`/api/studies/${id}/runs/${runIds[2]}`, { version: 2, outcomeId: 999999 })).status).toBe(400);
  });

  it('records measured factor values only for factors that track them', async () => {
    const { id, runIds } = makeStudy(t);
    const ok = await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, measured: { A: '0.512' } });
    expect(ok.body.run.measured.A).toEqual({ text: '0.512', value: 0.512 });
    const no = await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 2, measured: { B: '1' } });
    expect(no.status).toBe(400);
    expect(no.body.message).toMatch(/Factor "B" does not record measured values/);
  });

  it('is refused to reviewers and viewers; non-members see 404', async () => {
    const { id, runIds } = makeStudy(t);
    expect((await statistician.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, notes: 'x' })).status).toBe(403);
    expect((await supervisor.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, notes: 'x' })).status).toBe(403);
    const other = makeStudy(t, { members: false });
    expect((await supervisor.patch(`/api/studies/${other.id}/runs/${other.runIds[0]}`, { version: 1, notes: 'x' })).status).toBe(404);
    expect((await engineer.patch(`/api/studies/${id}/runs/${other.runIds[0]}`, { version: 1, notes: 'x' })).status).toBe(400);
  });

  it('moves a planned study to collecting with the first value', async () => {
    const { id, runIds } = makeStudy(t);
    t.ctx.db.update(studies).set({ status: 'planned' }).where(eq(studies.id, id)).run();
    await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, values: { ang: '30.5' } });
    expect((await engineer.get(`/api/studies/${id}`)).body.study.status).toBe('collecting');
  });
});

describe('batch (multi-cell paste)', () => {
  it('applies all edits in one go and returns an undo that restores them', async () => {
    const { id, runIds } = makeStudy(t);
    await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, values: { H: '0.40' } });
    const res = await engineer.post(`/api/studies/${id}/runs/batch`, {
      edits: [
        { runId: runIds[0], version: 2, values: { H: '0.41', ang: '-12.5' } },
        { runId: runIds[1], version: 1, values: { H: '0.42' }, notes: 'pasted' },
      ],
    });
    expect(res.status).toBe(200);
    expect(res.body.changes).toHaveLength(4);
    expect(res.body.runs.map((r: SheetRun) => r.version)).toEqual([3, 2]);
    const undo = await engineer.post(`/api/studies/${id}/runs/batch`, res.body.undo);
    expect(undo.status).toBe(200);
    const after = (await sheet(id)).runs;
    expect(after[0]!.values).toEqual({ H: { text: '0.40', value: 0.4, outOfRange: false } });
    expect(after[1]!.values).toEqual({});
    expect(after[1]!.notes).toBe('');
  });

  it('writes nothing when one edit is stale (409) or one value is bad (400)', async () => {
    const { id, runIds } = makeStudy(t);
    await engineer.patch(`/api/studies/${id}/runs/${runIds[1]}`, { version: 1, notes: 'moved on' });
    const stale = await engineer.post(`/api/studies/${id}/runs/batch`, {
      edits: [{ runId: runIds[0], version: 1, values: { H: '0.3' } }, { runId: runIds[1], version: 1, values: { H: '0.3' } }],
    });
    expect(stale.status).toBe(409);
    expect(stale.body.current.code).toBe('R002');
    const bad = await engineer.post(`/api/studies/${id}/runs/batch`, {
      edits: [{ runId: runIds[0], version: 1, values: { H: '0.3' } }, { runId: runIds[2], version: 1, values: { H: 'abc' } }],
    });
    expect(bad.status).toBe(400);
    expect(bad.body.details).toEqual([{ path: 'edits.1.values.H', message: 'H: "abc" is not a number' }]);
    const runs = (await sheet(id)).runs;
    expect(runs.filter((r) => Object.keys(r.values).length > 0)).toEqual([]);
    expect((await engineer.post(`/api/studies/${id}/runs/batch`, { edits: [] })).status).toBe(400);
  });
});

describe('removing a run', () => {
  it('needs a reason, is soft, audited and reversible', async () => {
    const { id, runIds } = makeStudy(t);
    const noReason = await engineer.delete(`/api/studies/${id}/runs/${runIds[3]}`, {});
    expect(noReason.status).toBe(400);
    expect(noReason.body.message).toMatch(/Say why the run is removed/);
    const res = await engineer.delete(`/api/studies/${id}/runs/${runIds[3]}`, { reason: 'specimen machined to the wrong drawing' });
    expect(res.status).toBe(200);
    expect(res.body.run).toMatchObject({ removedReason: 'specimen machined to the wrong drawing', excluded: true });
    const s = await sheet(id);
    expect(s.runs).toHaveLength(11);
    expect(s.counts).toMatchObject({ planned: 11, removed: 1 });
    expect((await sheet(id, '?includeRemoved=1')).runs).toHaveLength(12);
    const edit = await engineer.patch(`/api/studies/${id}/runs/${runIds[3]}`, { version: 2, notes: 'x' });
    expect(edit.body.message).toMatch(/was removed .* restore it before editing/);
    expect((await engineer.delete(`/api/studies/${id}/runs/${runIds[3]}`, { reason: 'again please' })).status).toBe(409);
    const back = await engineer.post(`/api/studies/${id}/runs/${runIds[3]}/restore`, { reason: 'drawing was right after all' });
    expect(back.body.run.removedAt).toBeNull();
    const history = (await engineer.get(`/api/studies/${id}/runs/${runIds[3]}/history`)).body.events.map((e: { action: string }) => e.action);
    expect(history).toEqual(['restore', 'remove']);
    expect((await supervisor.delete(`/api/studies/${id}/runs/${runIds[3]}`, { reason: 'viewer tries' })).status).toBe(403);
  });
});
