import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { CALC_VERSION } from '../../server/calc/version.js';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { makeStudy } from './study-fixtures.js';

/*
 * Per-run angle from two measuring points, end to end through the API. The histories are synthetic:
 * point 2 moves relative to point 1 by fixed-length steps in the directions ANGLES, on top of a
 * motion common to both points (which must cancel). The exact answer is ANGLES itself: early maximum
 * 45° at frames 10 → 11, plateau of 35° from frame 13 on (constructed rigid relative motion, no source).
 */
const ANGLES = [...Array.from({ length: 10 }, (_, i) => 20 + 2.5 * i), 45, 41, 38, ...Array.from({ length: 30 }, () => 35)];

function historyCsv(angles: readonly number[], opts: { reverse?: boolean; header?: string; dropFrame?: number; badCell?: number } = {}): string {
  const lines = [opts.header ?? 'Frame,P1 ux [mm],P1 uy [mm],P2 ux [mm],P2 uy [mm]'];
  let dx = 0;
  let dy = 0;
  for (let k = 0; k <= angles.length; k++) {
    if (k > 0) {
      dx += 0.02 * Math.cos((angles[k - 1]! * Math.PI) / 180);
      dy += 0.02 * Math.sin((angles[k - 1]! * Math.PI) / 180);
    }
    if (k === opts.dropFrame) continue;
    const cx = 0.05 * k;
    const cy = -0.01 * k;
    const p1 = [cx, cy];
    const p2 = [cx + dx, cy + dy];
    const [a, b] = opts.reverse ? [p2, p1] : [p1, p2];
    const cells = [k, a[0], a[1], b[0], b[1]].map((v) => String(v));
    if (k === opts.badCell) cells[2] = 'n/a';
    lines.push(cells.join(','));
  }
  return lines.join('\n') + '\n';
}

const MAPPING = { frame: 'Frame', u1x: 'P1 ux [mm]', u1y: 'P1 uy [mm]', u2x: 'P2 ux [mm]', u2y: 'P2 uy [mm]' };
const UNITS = { length: 'mm', frame: 'frame' };

let t: TestApp;
let engineer: Client;
let supervisor: Client;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  supervisor = await signIn(t.app, 'supervisor');
});
afterAll(() => t.close());

const upload = (client: Client, studyId: number, runId: number, body: Buffer | string, name: string) =>
  client.agent.post(`/api/studies/${studyId}/runs/${runId}/angle/files`).set('X-XSRF-TOKEN', client.xsrf).attach('file', Buffer.from(body), name);

async function primed(): Promise<void> {
  await engineer.prime();
  await supervisor.prime();
}

describe('per-run angle: upload → compute → store', () => {
  it('keeps the file as an attachment, finds the exact maximum and plateau, and stores the plateau with provenance and audit rows', async () => {
    await primed();
    const { id, runIds } = makeStudy(t);
    const runId = runIds[0]!;
    const csv = historyCsv(ANGLES);
    const up = await upload(engineer, id, runId, csv, 'run1-points.csv');
    expect(up.status).toBe(201);
    // SHA-256 of the exact bytes sent (FIPS 180-4 through node:crypto)
    expect(up.body.file.sha256).toBe(createHash('sha256').update(csv).digest('hex'));
    expect(up.body.file.suggestedMapping).toEqual(MAPPING);
    const atts = await supervisor.get(`/api/studies/${id}/runs/${runId}/attachments`);
    expect(atts.body.attachments[0]).toMatchObject({ id: up.body.file.attachmentId, kind: 'dic-export', fileName: 'run1-points.csv' });

    const body = { attachmentId: up.body.file.attachmentId, mapping: MAPPING, units: UNITS, parameters: {} };
    const comp = await supervisor.post(`/api/studies/${id}/runs/${runId}/angle/compute`, body);
    expect(comp.status).toBe(200);
    const r = comp.body.result;
    expect(r.curve).toHaveLength(ANGLES.length);
    r.curve.forEach((c: { angleDeg: number }, i: number) => expect(c.angleDeg).toBeCloseTo(ANGLES[i]!, 9)); // constructed, exact
    expect(r.maximum).toMatchObject({ fromFrame: 10, toFrame: 11 });
    expect(r.maximum.angleDeg).toBeCloseTo(45, 9);
    expect(r.plateau).toMatchObject({ startFrame: 13, endFrame: ANGLES.length, increments: 30 });
    expect(r.plateau.meanAngleDeg).toBeCloseTo(35, 9);
    // Defaults stated by the engine (server/calc/displacement-angle.ts)
    expect(r.parameters).toMatchObject({ smoothingWindow: 1, minRelativeDisplacement: 0, plateauHalfBandDeg: 1, minPlateauIncrements: 5 });

    const run = (await engineer.get(`/api/studies/${id}/calc`)).body.runs.find((x: { runId: number }) => x.runId === runId);
    const stored = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/store`, { ...body, method: 'plateau', response: 'ang', version: run.version, reason: 'plateau of DIC run' });
    expect(stored.status).toBe(200);
    expect(stored.body.stored.text).toBe('35.0000');
    const prov = stored.body.run.values.ang.provenance;
    expect(prov).toMatchObject({ kind: 'relative-displacement-angle', calcVersion: CALC_VERSION, method: 'plateau', sha256: up.body.file.sha256, attachmentId: up.body.file.attachmentId, featureFrames: { from: 13, to: ANGLES.length } });
    expect(prov.framesUsed).toEqual({ count: ANGLES.length + 1, first: 0, last: ANGLES.length });
    const sheet = await engineer.get(`/api/studies/${id}/runs`);
    expect(sheet.body.runs.find((x: { id: number }) => x.id === runId).values.ang.text).toBe('35.0000');
    const audit = (await engineer.get(`/api/studies/${id}/audit?runId=${runId}`)).body.events as { action: string; field: string; newValue: string; reason: string }[];
    expect(audit.find((e) => e.field === 'value:ang')).toMatchObject({ action: 'calc-angle', newValue: '35.0000', reason: 'plateau of DIC run' });
    expect(audit.find((e) => e.field === 'provenance:ang')?.newValue).toContain(up.body.file.sha256);
  });

  it('re-computing with other parameters or another file updates the value through the audited path; a stale version is 409', async () => {
    await primed();
    const { id, runIds } = makeStudy(t);
    const runId = runIds[1]!;
    const up = await upload(engineer, id, runId, historyCsv(ANGLES), 'a.csv');
    const body = { attachmentId: up.body.file.attachmentId, mapping: MAPPING, units: UNITS, parameters: {} };
    const first = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/store`, { ...body, method: 'max', response: 'ang', version: 1 });
    expect(first.status).toBe(200);
    expect(first.body.stored.text).toBe('45.0000');
    const v2 = first.body.run.version as number;
    expect(v2).toBe(2);
    // Same file, plateau instead of maximum: the value changes (audited), the version moves.
    const second = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/store`, { ...body, method: 'plateau', response: 'ang', version: v2 });
    expect(second.body.stored.text).toBe('35.0000');
    expect(second.body.changes).toEqual([expect.objectContaining({ field: 'value:ang', oldValue: '45.0000', newValue: '35.0000' })]);
    // Same value from a new parameter (wider band): only the provenance changes, still audited and versioned.
    const third = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/store`, { ...body, parameters: { plateauHalfBandDeg: 0.5 }, method: 'plateau', response: 'ang', version: second.body.run.version });
    expect(third.status).toBe(200);
    expect(third.body.run.version).toBe(second.body.run.version + 1);
    expect(third.body.run.values.ang.provenance.parameters.plateauHalfBandDeg).toBe(0.5);
    const stale = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/store`, { ...body, method: 'max', response: 'ang', version: v2 });
    expect(stale.status).toBe(409);
    // A new file (reversed point order) replaces the source; the order is detected and said.
    const rev = await upload(engineer, id, runId, historyCsv(ANGLES, { reverse: true }), 'b.csv');
    const fourth = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/store`, { ...body, attachmentId: rev.body.file.attachmentId, method: 'max', response: 'ang', version: third.body.run.version });
    expect(fourth.status).toBe(200);
    expect(fourth.body.result.reversedOrder).toBe(true);
    expect(fourth.body.stored.text).toBe('45.0000');
    expect(fourth.body.run.values.ang.provenance).toMatchObject({ attachmentId: rev.body.file.attachmentId, reversedOrder: true });
    const events = (await engineer.get(`/api/studies/${id}/audit?runId=${runId}&field=provenance:ang`)).body.events;
    expect(events).toHaveLength(4);
  });

  it('reports missing frames and dropped rows, reads XLSX, and accepts a JSON push from a script', async () => {
    await primed();
    const { id, runIds } = makeStudy(t);
    const runId = runIds[2]!;
    const gappy = await upload(engineer, id, runId, historyCsv(ANGLES, { dropFrame: 20, badCell: 30 }), 'gappy.csv');
    const comp = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/compute`, { attachmentId: gappy.body.file.attachmentId, mapping: MAPPING, units: UNITS });
    expect(comp.body.result.droppedRows).toEqual([expect.objectContaining({ frame: 30, reason: expect.stringMatching(/u1y/) })]);
    // The missing frame 20 and the dropped row of frame 30 both leave a gap in the frame sequence.
    expect(comp.body.result.gaps).toEqual([{ afterFrame: 19, beforeFrame: 21 }, { afterFrame: 29, beforeFrame: 31 }]);
    // Across a gap the two 35° steps add up to one 35° increment: the plateau value is unchanged (exact).
    expect(comp.body.result.plateau.meanAngleDeg).toBeCloseTo(35, 9);

    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('points');
    for (const line of historyCsv(ANGLES).trim().split('\n')) ws.addRow(line.split(',').map((c, i) => (/^[-\d.e]+$/.test(c) && i >= 0 ? Number(c) : c)));
    const xlsx = Buffer.from(await wb.xlsx.writeBuffer());
    const up = await upload(engineer, id, runId, xlsx, 'points.xlsx');
    expect(up.status).toBe(201);
    const fromXlsx = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/compute`, { attachmentId: up.body.file.attachmentId, mapping: MAPPING, units: UNITS });
    expect(fromXlsx.body.result.maximum.angleDeg).toBeCloseTo(45, 9);

    const rows = historyCsv(ANGLES).trim().split('\n').slice(1).map((l) => {
      const [frame, u1x, u1y, u2x, u2y] = l.split(',').map(Number);
      return { frame: frame!, u1x: u1x!, u1y: u1y!, u2x: u2x!, u2y: u2y! };
    });
    const push = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/push`, { fileName: 'script-run3.csv', rows, units: UNITS, store: { method: 'max', response: 'ang', version: 1 } });
    expect(push.status).toBe(201);
    expect(push.body.stored.text).toBe('45.0000');
    expect(push.body.run.values.ang.provenance.fileName).toBe('script-run3.csv');
  });
});

describe('per-run angle: refusals', () => {
  it('refuses bad files and mappings with 400 naming the problem', async () => {
    await primed();
    const { id, runIds } = makeStudy(t);
    const runId = runIds[3]!;
    expect((await upload(engineer, id, runId, 'x', 'photo.png')).body.message).toMatch(/must be a CSV or XLSX file/);
    expect((await upload(engineer, id, runId, '', 'empty.csv')).body.message).toMatch(/is empty/);
    expect((await upload(engineer, id, runId, 'PK\u0003\u0004garbage', 'broken.xlsx')).body.message).toMatch(/"broken\.xlsx".*not a readable .*XLSX/);
    expect((await upload(engineer, id, runId, Buffer.from([0xff, 0xfe, 0x41]), 'latin.csv')).body.message).toMatch(/not UTF-8/);
    const atts = await engineer.get(`/api/studies/${id}/runs/${runId}/attachments`);
    expect(atts.body.attachments).toEqual([]);

    const up = await upload(engineer, id, runId, historyCsv(ANGLES), 'ok.csv');
    const badMap = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/compute`, { attachmentId: up.body.file.attachmentId, mapping: { ...MAPPING, u2y: 'P2 uz' }, units: UNITS });
    expect(badMap.status).toBe(400);
    expect(badMap.body.message).toMatch(/mapping\.u2y: column "P2 uz" is not in "ok\.csv"/);
    const twice = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/compute`, { attachmentId: up.body.file.attachmentId, mapping: { ...MAPPING, u2y: 'P2 ux [mm]' }, units: UNITS });
    expect(twice.body.message).toMatch(/already mapped to u2x/);
    const even = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/compute`, { attachmentId: up.body.file.attachmentId, mapping: MAPPING, units: UNITS, parameters: { smoothingWindow: 4 } });
    expect(even.status).toBe(400);
    expect(even.body.message).toMatch(/smoothingWindow = 4 must be odd/);
    const tooFew = await upload(engineer, id, runId, 'Frame,P1 ux [mm],P1 uy [mm],P2 ux [mm],P2 uy [mm]\n0,0,0,0,0\n1,0,0,1,0\n', 'short.csv');
    const few = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/compute`, { attachmentId: tooFew.body.file.attachmentId, mapping: MAPPING, units: UNITS });
    expect(few.body.message).toMatch(/only 2 usable frame\(s\)/);
    const otherRun = await engineer.post(`/api/studies/${id}/runs/${runIds[4]}/angle/compute`, { attachmentId: up.body.file.attachmentId, mapping: MAPPING, units: UNITS });
    expect(otherRun.body.message).toMatch(/belongs to another run/);
    const noPlateau = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/store`, { attachmentId: up.body.file.attachmentId, mapping: MAPPING, units: UNITS, parameters: { minPlateauIncrements: 500 }, method: 'plateau', response: 'ang', version: 1 });
    expect(noPlateau.status).toBe(400);
    expect(noPlateau.body.message).toMatch(/no plateau of 500 increments/);
    const unknown = await engineer.post(`/api/studies/${id}/runs/${runId}/angle/store`, { attachmentId: up.body.file.attachmentId, mapping: MAPPING, units: UNITS, method: 'max', response: 'phi', version: 1 });
    expect(unknown.body.message).toMatch(/no response "phi"/);
  });

  it('lets a viewer compute but not upload or store', async () => {
    await primed();
    const { id, runIds } = makeStudy(t);
    const runId = runIds[0]!;
    expect((await upload(supervisor, id, runId, historyCsv(ANGLES), 'v.csv')).status).toBe(403);
    const up = await upload(engineer, id, runId, historyCsv(ANGLES), 'e.csv');
    const body = { attachmentId: up.body.file.attachmentId, mapping: MAPPING, units: UNITS };
    expect((await supervisor.post(`/api/studies/${id}/runs/${runId}/angle/compute`, body)).status).toBe(200);
    const store = await supervisor.post(`/api/studies/${id}/runs/${runId}/angle/store`, { ...body, method: 'max', response: 'ang', version: 1 });
    expect(store.status).toBe(403);
    expect(store.body.message).toMatch(/needs the study role owner or contributor; you are viewer/);
    const push = await supervisor.post(`/api/studies/${id}/runs/${runId}/angle/push`, { fileName: 'x.csv', rows: [], units: UNITS });
    expect(push.status).toBe(403);
    const sheet = await engineer.get(`/api/studies/${id}/runs`);
    expect(sheet.body.runs[0].values).toEqual({});
  });
});
