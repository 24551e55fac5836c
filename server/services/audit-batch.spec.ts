import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../db/client.js';
import { AuditBatch, type AuditRow } from './audit-batch.js';

// The batch must write exactly the rows it was given, one per add(), in order: the expected values
// are the inputs themselves (common practice, no source).

const dir = mkdtempSync(path.join(tmpdir(), 'specimetry-audit-batch-'));
const db = openDatabase(path.join(dir, 'test.db'));
afterAll(() => {
  db.$client.close();
  rmSync(dir, { recursive: true, force: true });
});

const row = (i: number): AuditRow => ({
  at: 1_700_000_000_000 + i,
  userId: null,
  tokenId: null,
  studyId: null, // no study row in this database; the column is nullable
  runId: i,
  entity: 'run',
  entityId: String(i),
  action: 'import',
  field: `value:H${i % 3}`,
  oldValue: i % 2 ? null : `old ${i}`,
  newValue: `new ${i}`,
  reason: i % 5 ? 'import #1 (bench.csv)' : null,
});

interface Stored { id: number; at: number; run_id: number; entity_id: string; action: string; field: string; old_value: string | null; new_value: string; reason: string | null }

describe('AuditBatch', () => {
  it.each([0, 1, 63, 64, 65, 64 * 3 + 7])('writes %i rows, one per add, in order, with every column', (n) => {
    db.$client.prepare('delete from audit_events').run();
    db.$client.transaction(() => {
      const batch = new AuditBatch(db.$client);
      for (let i = 0; i < n; i++) batch.add(row(i));
      batch.flush();
      batch.flush(); // a second flush writes nothing more
    })();
    const stored = db.$client.prepare('select id, at, run_id, entity_id, action, field, old_value, new_value, reason from audit_events order by id').all() as Stored[];
    expect(stored).toHaveLength(n);
    stored.forEach((s, i) => {
      const r = row(i);
      expect([s.at, s.run_id, s.entity_id, s.action, s.field, s.old_value, s.new_value, s.reason]).toEqual([r.at, r.runId, r.entityId, r.action, r.field, r.oldValue, r.newValue, r.reason]);
    });
  });

  it('leaves nothing behind when the transaction around it fails', () => {
    db.$client.prepare('delete from audit_events').run();
    const failing = db.$client.transaction(() => {
      const batch = new AuditBatch(db.$client);
      for (let i = 0; i < 100; i++) batch.add(row(i));
      batch.flush();
      throw new Error('rolled back on purpose');
    });
    expect(() => failing()).toThrow(/rolled back on purpose/);
    expect(db.$client.prepare('select count(*) from audit_events').pluck().get()).toBe(0);
  });
});
