import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn, startTestApp, type Client, type TestApp } from './harness.js';
import { seedStudy, type SeededStudy } from './hardening-study.js';

// Optimistic concurrency on the run sheet (docs/api-studies.md: each run has a version; a stale write
// is 409 with the current run). "Lost update" as defined by Berenson et al., "A Critique of ANSI SQL
// Isolation Levels" (SIGMOD 1995, phenomenon P4): a write based on a stale read overwrites another.

let t: TestApp;
let s: SeededStudy;
let owner: Client;
let contributor: Client;

beforeAll(async () => {
  t = await startTestApp();
  s = seedStudy(t.ctx, { replicates: 4, members: [{ email: 'admin@specimetry.test', role: 'contributor' }] });
  owner = await signIn(t.app, 'engineer');
  contributor = await signIn(t.app, 'admin');
  await Promise.all([owner.prime(), contributor.prime()]);
});
afterAll(() => t.close());

const runUrl = (id: number) => `/api/studies/${s.studyId}/runs/${id}`;
async function readRun(id: number) {
  const sheet = await owner.get(`/api/studies/${s.studyId}/runs`);
  return (sheet.body.runs as { id: number; version: number; values: Record<string, { text: string }>; notes: string; operator: string; outcomeReason: string; testedOn: string }[]).find((r) => r.id === id)!;
}

describe('editing the same data at once', () => {
  it('two clients writing the same cell from the same version: one 200, one 409 with the winner\'s value', async () => {
    const run = s.runs[0]!;
    const [a, b] = await Promise.all([
      owner.patch(runUrl(run.id), { version: 1, values: { H: '0.811' } }),
      contributor.patch(runUrl(run.id), { version: 1, values: { H: '0.822' } }),
    ]);
    const statuses = [a.status, b.status].sort();
    expect(statuses).toEqual([200, 409]);
    const winner = a.status === 200 ? a : b;
    const loser = a.status === 409 ? a : b;
    expect(loser.body.current.values.H.text).toBe(winner.body.run.values.H.text);
    expect((await readRun(run.id)).values['H']!.text).toBe(winner.body.run.values.H.text);
  });

  it('N editors on distinct runs in parallel: every write lands', async () => {
    const targets = s.runs.slice(1, 11);
    const results = await Promise.all(targets.map((r, i) => (i % 2 ? owner : contributor).patch(runUrl(r.id), { version: 1, values: { H: `0.${100 + i}` } })));
    expect(results.map((r) => r.status)).toEqual(targets.map(() => 200));
    const sheet = await owner.get(`/api/studies/${s.studyId}/runs`);
    for (const [i, r] of targets.entries()) {
      expect(sheet.body.runs.find((x: { id: number }) => x.id === r.id).values.H.text).toBe(`0.${100 + i}`);
    }
  });

  it('N editors on distinct cells of one run, retrying on 409 with a fresh read: zero lost updates', async () => {
    const run = s.runs[11]!;
    const cells: Record<string, unknown>[] = [
      { values: { H: '1.101' } },
      { values: { r: '2.202' } },
      { notes: 'necking visible at 4.1 mm' },
      { operator: 'K. Operator' },
      { outcomeReason: 'checked twice' },
      { testedOn: '2026-03-14' },
    ];
    let conflicts = 0;
    const edit = async (cell: Record<string, unknown>, i: number) => {
      const client = i % 2 ? owner : contributor;
      let version = 1;
      for (let attempt = 0; attempt < 20; attempt++) {
        const res = await client.patch(runUrl(run.id), { version, ...cell });
        if (res.status === 200) return;
        expect(res.status).toBe(409);
        conflicts++;
        version = res.body.current.version as number;
      }
      throw new Error(`edit ${i} never landed`);
    };
    await Promise.all(cells.map(edit));
    const final = await readRun(run.id);
    expect(final.values['H']!.text).toBe('1.101');
    expect(final.values['r']!.text).toBe('2.202');
    expect(final.notes).toBe('necking visible at 4.1 mm');
    expect(final.operator).toBe('K. Operator');
    expect(final.outcomeReason).toBe('checked twice');
    expect(final.testedOn).toBe('2026-03-14');
    expect(final.version).toBe(1 + cells.length);
    // Every cell went in once: one audit row per field, no overwritten duplicates.
    const rows = t.ctx.db.$client.prepare('select count(*) as n from audit_events where run_id = ? and entity = ?').get(run.id, 'run') as { n: number };
    expect(rows.n).toBe(cells.length);
    expect(conflicts).toBeGreaterThan(0);
  });

  it('parallel bulk pushes with distinct keys to distinct runs all land; the same key twice lands once', async () => {
    const targets = s.runs.slice(12, 20);
    const pushes = await Promise.all(
      targets.map((r, i) => owner.agent.post(`/api/studies/${s.studyId}/results`).set('X-XSRF-TOKEN', owner.xsrf).set('Idempotency-Key', `par-push-${i}-xxxx`).send([{ runId: r.id, values: { r: `3.${i}` } }])),
    );
    expect(pushes.map((p) => p.status)).toEqual(targets.map(() => 200));
    const same = targets[0]!;
    const twice = await Promise.all([0, 1].map(() => owner.agent.post(`/api/studies/${s.studyId}/results`).set('X-XSRF-TOKEN', owner.xsrf).set('Idempotency-Key', 'par-push-same-key').send([{ runId: same.id, values: { H: '0.5' } }])));
    expect(twice.map((p) => p.status)).toEqual([200, 200]);
    expect(twice.filter((p) => p.headers['idempotent-replayed'] === 'true')).toHaveLength(1);
    const audit = t.ctx.db.$client.prepare("select count(*) as n from audit_events where run_id = ? and field = 'value:H'").get(same.id) as { n: number };
    expect(audit.n).toBe(1);
  });
});
