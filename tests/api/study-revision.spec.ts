import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { completeSpec, previewAnalysis } from '../../server/services/analysis.js';
import { runSheet } from '../../server/services/run-sheet.js';
import { studyRevision } from '../../server/services/study-revision.js';
import { analysisSpec } from '../../shared/analysis.js';
import { decodeRunColumns, type RunColumns } from '../../shared/run-sheet.js';
import { insertStudy, rel, warpbreaks, warpbreaksStudy } from './analysis-fixtures.js';
import { signIn, startTestApp, type Client, type TestApp } from './harness.js';
import { makeStudy, userId } from './study-fixtures.js';

// The per-study data revision (drizzle/0002_study-revisions.sql) and the caches keyed by it
// (DEVELOPERS.md, caching). Expected values are the product's own rules (a write moves the
// revision; a read after a write shows the write): common practice, no source — except the ANOVA
// figures, which come from R (cited where used).

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

const sql = (text: string, ...args: (string | number | null)[]) => t.ctx.db.$client.prepare(text).run(...args);
const rev = (studyId: number): number => {
  const r = studyRevision(t.ctx.db, studyId);
  if (r === null) throw new Error(`study ${studyId} has no revision row`);
  return r;
};

/** One fixture study plus the ids a write needs. */
function fixture() {
  const { id, runIds } = makeStudy(t);
  const one = (q: string) => t.ctx.db.$client.prepare(q).pluck().get(id) as number;
  return {
    id,
    runId: runIds[0]!,
    responseId: one('select id from responses where study_id = ? order by position limit 1'),
    factorId: one("select id from factors where study_id = ? and symbol = 'A'"),
    user: userId(t, 'engineer'),
  };
}
type Fixture = ReturnType<typeof fixture>;

/** Insert, update and delete of every table holding a study's data, written as plain SQL (no service). */
const WRITES: { table: string; insert: (f: Fixture) => void; update: (f: Fixture) => void; del: (f: Fixture) => void }[] = [
  {
    table: 'studies',
    insert: () => sql("insert into studies (title, owner_id) values ('other', ?)", userId(t, 'engineer')),
    update: (f) => sql("update studies set purpose = 'changed' where id = ?", f.id),
    del: () => undefined, // deleting the study itself: its own test below
  },
  {
    table: 'factors',
    insert: (f) => sql(`insert into factors (study_id, position, name, symbol, kind, levels) values (?, 9, 'Extra', 'X', 'categorical', '[{"value":"a"}]')`, f.id),
    update: (f) => sql("update factors set name = 'Renamed' where study_id = ? and symbol = 'X'", f.id),
    del: (f) => sql("delete from factors where study_id = ? and symbol = 'X'", f.id),
  },
  {
    table: 'responses',
    insert: (f) => sql("insert into responses (study_id, position, name, symbol, goal) values (?, 9, 'Extra', 'Y', 'scatter')", f.id),
    update: (f) => sql("update responses set unit = 'mm' where study_id = ? and symbol = 'Y'", f.id),
    del: (f) => sql("delete from responses where study_id = ? and symbol = 'Y'", f.id),
  },
  {
    table: 'outcomes',
    insert: (f) => sql("insert into outcomes (study_id, position, label, valid) values (?, 9, 'slipped in grip', 0)", f.id),
    update: (f) => sql("update outcomes set valid = 1 where study_id = ? and label = 'slipped in grip'", f.id),
    del: (f) => sql("delete from outcomes where study_id = ? and label = 'slipped in grip'", f.id),
  },
  {
    table: 'plans',
    insert: (f) => sql("insert into plans (study_id, spec, summary, created_by) values (?, '{}', '{}', ?)", f.id, f.user),
    update: (f) => sql(`update plans set summary = '{"runs":1}' where study_id = ?`, f.id),
    del: (f) => sql('delete from plans where study_id = ?', f.id),
  },
  {
    table: 'runs',
    insert: (f) => sql(`insert into runs (study_id, code, standard_order, run_order, settings) values (?, 'R900', 900, 900, '{"A":"0.5","B":"vee"}')`, f.id),
    update: (f) => sql("update runs set notes = 'regripped' where study_id = ? and code = 'R900'", f.id),
    del: (f) => sql("delete from runs where study_id = ? and code = 'R900'", f.id),
  },
  {
    table: 'run_values',
    insert: (f) => sql("insert into run_values (run_id, response_id, text, value) values (?, ?, '0.85', 0.85)", f.runId, f.responseId),
    update: (f) => sql("update run_values set text = '0.86', value = 0.86 where run_id = ? and response_id = ?", f.runId, f.responseId),
    del: (f) => sql('delete from run_values where run_id = ? and response_id = ?', f.runId, f.responseId),
  },
  {
    table: 'run_measurements',
    insert: (f) => sql("insert into run_measurements (run_id, factor_id, text, value) values (?, ?, '0.51', 0.51)", f.runId, f.factorId),
    update: (f) => sql("update run_measurements set text = '0.52', value = 0.52 where run_id = ? and factor_id = ?", f.runId, f.factorId),
    del: (f) => sql('delete from run_measurements where run_id = ? and factor_id = ?', f.runId, f.factorId),
  },
  {
    table: 'attachments',
    insert: (f) => sql("insert into attachments (study_id, run_id, file_name, mime_type, size_bytes, sha256, stored_name, uploaded_by) values (?, ?, 'a.csv', 'text/csv', 1, 'x', 'stored-a', ?)", f.id, f.runId, f.user),
    update: (f) => sql("update attachments set kind = 'dic-export' where study_id = ?", f.id),
    del: (f) => sql('delete from attachments where study_id = ?', f.id),
  },
];

describe('study revision triggers', () => {
  it('gives a new study revision 1', () => {
    const { id } = makeStudy(t);
    // makeStudy wrote factors, responses, members and runs after creating the study: already past 1
    expect(rev(id)).toBeGreaterThan(1);
    const res = sql("insert into studies (title, owner_id) values ('bare', ?)", userId(t, 'engineer'));
    expect(rev(Number(res.lastInsertRowid))).toBe(1);
  });

  it.each(WRITES.filter((w) => w.table !== 'studies'))('moves on with every insert, update and delete of $table, and only for its study', (w) => {
    const f = fixture();
    const bystander = fixture();
    const before = rev(bystander.id);
    for (const step of [w.insert, w.update, w.del]) {
      const r0 = rev(f.id);
      step(f);
      expect(rev(f.id)).toBeGreaterThan(r0);
    }
    expect(rev(bystander.id)).toBe(before);
  });

  it('moves on when the study row itself changes, and stays (never resets) after the study is deleted', () => {
    const f = fixture();
    const r0 = rev(f.id);
    WRITES[0]!.update(f);
    expect(rev(f.id)).toBeGreaterThan(r0);
    const r1 = rev(f.id);
    // cascade of the delete removes runs, values, factors, ...: each of those deletes bumps again
    sql('delete from study_members where study_id = ?', f.id);
    sql('delete from runs where study_id = ?', f.id);
    sql('delete from studies where id = ?', f.id);
    expect(rev(f.id)).toBeGreaterThan(r1);
  });

  it('moves on with writes made through the API (a run-sheet edit)', async () => {
    const f = fixture();
    const r0 = rev(f.id);
    const res = await engineer.patch(`/api/studies/${f.id}/runs/${f.runId}`, { version: 1, values: { H: '0.850' } });
    expect(res.status).toBe(200);
    expect(rev(f.id)).toBeGreaterThan(r0);
  });

  it('does not move when a write is rolled back', () => {
    const f = fixture();
    const r0 = rev(f.id);
    const failing = t.ctx.db.$client.transaction(() => {
      WRITES[5]!.insert(f);
      throw new Error('rolled back on purpose');
    });
    expect(() => failing()).toThrow(/rolled back on purpose/);
    expect(rev(f.id)).toBe(r0);
  });
});

interface SheetBody {
  runs: { id: number; code: string; values: Record<string, { text: string }>; notes: string; version: number }[];
  counts: Record<string, number>;
}

describe('run-sheet cache', () => {
  it('answers If-None-Match with 304 and a write with fresh data and a new ETag', async () => {
    const f = fixture();
    const first = await engineer.get(`/api/studies/${f.id}/runs`);
    expect(first.status).toBe(200);
    const etag = first.headers['etag'] as string;
    expect(etag).toMatch(/^W\/"/);
    expect(first.headers['cache-control']).toBe('private, no-cache');
    const again = await engineer.agent.get(`/api/studies/${f.id}/runs`).set('If-None-Match', etag);
    expect(again.status).toBe(304);

    await engineer.patch(`/api/studies/${f.id}/runs/${f.runId}`, { version: 1, values: { H: '0.850' } });
    const after = await engineer.agent.get(`/api/studies/${f.id}/runs`).set('If-None-Match', etag);
    expect(after.status).toBe(200);
    expect(after.headers['etag']).not.toBe(etag);
    expect((after.body as SheetBody).runs[0]!.values['H']!.text).toBe('0.850');
  });

  it('shows a write made outside the API (plain SQL) on the next read', async () => {
    const f = fixture();
    expect(((await engineer.get(`/api/studies/${f.id}/runs`)).body as SheetBody).runs[0]!.notes).toBe('');
    sql("update runs set notes = 'written by a script' where id = ?", f.runId);
    expect(((await engineer.get(`/api/studies/${f.id}/runs`)).body as SheetBody).runs[0]!.notes).toBe('written by a script');
  });

  it('sends Brotli or gzip to clients that accept them, the same JSON as uncompressed', async () => {
    const f = fixture();
    const plain = await engineer.agent.get(`/api/studies/${f.id}/runs`).set('Accept-Encoding', 'identity');
    expect(plain.headers['content-encoding']).toBeUndefined();
    const fetchRaw = (acceptEncoding: string) =>
      engineer.agent
        .get(`/api/studies/${f.id}/runs`)
        .set('Accept-Encoding', acceptEncoding)
        .buffer(true)
        .parse((r, cb) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => cb(null, Buffer.concat(chunks)));
        });
    // What each Accept-Encoding should get (RFC 9110 §12.5.3: q=0 means "not acceptable"; equal q leaves the choice to the server).
    const cases: [string, string | undefined][] = [
      ['gzip, deflate, br, zstd', 'br'],
      ['gzip, deflate, br', 'br'],
      ['gzip', 'gzip'],
      ['br;q=0.5, gzip', 'gzip'],
      ['br;q=0, gzip;q=0', undefined],
    ];
    for (const [asked, expected] of cases) {
      const res = await fetchRaw(asked);
      expect(res.headers['content-encoding'], asked).toBe(expected);
      expect(res.headers['vary']).toMatch(/Accept-Encoding/i);
      // superagent may or may not have decoded the body already when parse() is given: decode it if not
      const raw = res.body as Buffer;
      const looksLikeJson = raw[0] === 0x7b;
      const text = looksLikeJson ? raw.toString('utf8') : expected === 'br' ? brotliDecompressSync(raw).toString('utf8') : gunzipSync(raw).toString('utf8');
      expect(JSON.parse(text), asked).toEqual(plain.body);
    }
    expect(plain.body).toEqual(JSON.parse(JSON.stringify(runSheet(t.ctx.db, f.id, false))));
  });

  it('sends the column layout on request, the same runs as the row layout once decoded', async () => {
    // The seeded demo study has invalid runs, out-of-range values and a removed run is added here.
    const demoId = (t.ctx.db.$client.prepare('select min(id) from studies').pluck().get() as number);
    const sheet = (await engineer.get(`/api/studies/${demoId}/runs`)).body as SheetBody;
    const victim = sheet.runs[3]!;
    await engineer.delete(`/api/studies/${demoId}/runs/${victim.id}`, { reason: 'specimen mislabelled', version: victim.version });
    for (const q of ['', '&includeRemoved=1']) {
      const rows = await engineer.get(`/api/studies/${demoId}/runs?layout=rows${q}`);
      const cols = await engineer.get(`/api/studies/${demoId}/runs?layout=columns${q}`);
      expect(cols.status).toBe(200);
      expect(cols.headers['etag']).not.toBe(rows.headers['etag']);
      const body = cols.body as SheetBody & { runs: RunColumns };
      expect(body.runs.layout).toBe('columns');
      expect(body.runs.count).toBe((rows.body as SheetBody).runs.length);
      expect({ ...body, runs: decodeRunColumns(body.runs) }).toEqual(rows.body);
    }
    expect((await engineer.get(`/api/studies/${demoId}/runs?layout=sideways`)).status).toBe(400);
  });

  it('keeps the removed-runs variant apart from the live one', async () => {
    const f = fixture();
    await engineer.delete(`/api/studies/${f.id}/runs/${f.runId}`, { reason: 'cracked in the grip', version: 1 });
    const live = (await engineer.get(`/api/studies/${f.id}/runs`)).body as SheetBody;
    const all = (await engineer.get(`/api/studies/${f.id}/runs?includeRemoved=1`)).body as SheetBody;
    expect(all.runs.length).toBe(live.runs.length + 1);
    expect(live.runs.some((r) => r.id === f.runId)).toBe(false);
  });

  it('gives every member the same data and turns non-members away even with a cached entry and its ETag', async () => {
    const { id } = makeStudy(t, { members: false });
    const owner = await engineer.get(`/api/studies/${id}/runs`);
    expect(owner.status).toBe(200);
    const outsider = await statistician.agent.get(`/api/studies/${id}/runs`).set('If-None-Match', owner.headers['etag'] as string);
    // non-members get 404, not the cached sheet nor its ETag (server/auth/policy.ts: existence not disclosed)
    expect(outsider.status).toBe(404);
    expect(outsider.headers['etag']).not.toBe(owner.headers['etag']);
    expect(outsider.body.runs).toBeUndefined();

    const f = fixture(); // statistician: reviewer, supervisor: viewer
    const asOwner = await engineer.get(`/api/studies/${f.id}/runs`);
    const asViewer = await supervisor.get(`/api/studies/${f.id}/runs`);
    const asReviewer = await statistician.get(`/api/studies/${f.id}/runs`);
    expect(asViewer.body).toEqual(asOwner.body);
    expect(asReviewer.body).toEqual(asOwner.body);
  });

  it('serves from the cache: a write that bypasses the triggers stays unseen until the revision moves', async () => {
    // Proves the cache is used at all (otherwise the freshness tests above would pass without one).
    // The trigger is put back before the test ends.
    const f = fixture();
    const trigger = t.ctx.db.$client.prepare("select sql from sqlite_master where type = 'trigger' and name = 'runs_rev_update'").pluck().get() as string;
    expect((await engineer.get(`/api/studies/${f.id}/runs`)).status).toBe(200);
    sql('drop trigger runs_rev_update');
    try {
      sql("update runs set notes = 'unannounced' where id = ?", f.runId);
      expect(((await engineer.get(`/api/studies/${f.id}/runs`)).body as SheetBody).runs[0]!.notes).toBe('');
    } finally {
      sql(trigger);
    }
    sql("update runs set operator = 'A. Tester' where id = ?", f.runId);
    expect(((await engineer.get(`/api/studies/${f.id}/runs`)).body as SheetBody).runs[0]!.notes).toBe('unannounced');
  });
});

describe('analysis preview cache', () => {
  const spec = { response: 'breaks', factors: ['W', 'T'], terms: ['W', 'T', 'W:T'] };
  const ref = warpbreaks();

  it('shows an edit made after a cached preview, to every member', async () => {
    const { studyId, runIds } = insertStudy(t.ctx, warpbreaksStudy([{ email: 'supervisor@specimetry.test', role: 'viewer' }]));
    const url = `/api/studies/${studyId}/analyses/preview`;
    const first = await engineer.post(url, spec);
    expect(first.status).toBe(200);
    // R 4.2.2 summary(aov(breaks ~ wool * tension, data = warpbreaks)): wool SS (shared/reference/r-datasets/warpbreaks.json)
    const woolSs = ref.twoWay.table.find((r) => r.term === 'wool')!.ss;
    const ssOf = (body: { result: { anova: { source: string; ss: number }[] } }) => body.result.anova.find((r) => r.source === 'W')!.ss;
    expect(rel(ssOf(first.body), woolSs)).toBeLessThan(1e-9);
    expect((await supervisor.post(url, spec)).body).toEqual(first.body);

    // first warpbreaks row: 26 breaks, wool A, tension L (warpbreaks.json data.rows[0])
    const edit = await engineer.patch(`/api/studies/${studyId}/runs/${runIds[0]}`, { version: 1, values: { breaks: '126' } });
    expect(edit.status).toBe(200);
    const after = await supervisor.post(url, spec);
    expect(after.status).toBe(200);
    expect(rel(ssOf(after.body), woolSs)).toBeGreaterThan(1e-3);
    const uncached = previewAnalysis(t.ctx.db, studyId, completeSpec(analysisSpec.parse(spec)));
    expect(after.body).toEqual(JSON.parse(JSON.stringify(uncached)));
  });

  it('keys by the spec: a different model is computed, not served from another entry', async () => {
    const { studyId } = insertStudy(t.ctx, warpbreaksStudy());
    const url = `/api/studies/${studyId}/analyses/preview`;
    const full = await engineer.post(url, spec);
    const additive = await engineer.post(url, { ...spec, terms: ['W', 'T'] });
    expect(full.body.result.anova.map((r: { source: string }) => r.source)).toContain('W:T');
    expect(additive.body.result.anova.map((r: { source: string }) => r.source)).not.toContain('W:T');
    // the same spec with its fields in another order is the same request
    const reordered = await engineer.post(url, { terms: ['W', 'T', 'W:T'], factors: ['W', 'T'], response: 'breaks' });
    expect(reordered.body).toEqual(full.body);
  });

  it('turns a non-member away even when the preview is cached', async () => {
    const { studyId } = insertStudy(t.ctx, warpbreaksStudy());
    const url = `/api/studies/${studyId}/analyses/preview`;
    expect((await engineer.post(url, spec)).status).toBe(200);
    const outsider = await statistician.post(url, spec);
    expect(outsider.status).toBe(404); // server/auth/policy.ts: non-members get 404
    expect(outsider.body.result).toBeUndefined();
  });
});
