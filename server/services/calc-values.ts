import type { AngleProvenance, CalcRunSummary, CalcRunValue, DerivedHProvenance } from '../../shared/calc.js';
import type { Db } from '../db/client.js';
import type { Actor } from './actor.js';
import { applyRunEdits, type EditResult } from './run-edits.js';
import { loadRuns } from './run-sheet.js';
import { loadSetup, type Setup } from './study-setup.js';

/**
 * Calculated values reach the run sheet through the same audited path as typed ones
 * (`applyRunEdits`: decimal validation, optimistic concurrency, one audit row per changed field,
 * version bump). That path clears `provenance` on every write, because a typed value has none; this
 * service then records the calculation's provenance in the same transaction. A re-computation that
 * leaves the value's text unchanged but changes where it came from (new file, new parameters) is
 * still a change of the record: it gets its own audit row and moves the run version.
 */

export type Provenance = AngleProvenance | DerivedHProvenance;

export interface CalculatedValue {
  runId: number;
  /** The run version the caller read; omitted for derived responses recomputed from stored values. */
  version?: number;
  symbol: string;
  /** Decimal text to store, or null to clear the value. */
  text: string | null;
  provenance: Provenance | null;
}

/** Provenance without its time stamp: two calculations from the same inputs compare equal. */
function substance(p: Provenance | null): string | null {
  if (!p) return null;
  const { computedAt: _ignored, ...rest } = p;
  return JSON.stringify(rest);
}

/**
 * Write calculated values with their provenance, all or nothing.
 * @throws {HttpError} 400/409 from the run-edit service (bad value, stale version, removed run)
 */
export function writeCalculatedValues(db: Db, actor: Actor, studyId: number, items: readonly CalculatedValue[], opts: { source: string; reason?: string | null }): EditResult {
  return db.transaction(() => {
    const setup = loadSetup(db, studyId);
    const responseId = new Map(setup.responses.map((r) => [r.symbol, r.id]));
    const c = db.$client;
    const readProv = c.prepare('select provenance from run_values where run_id = ? and response_id = ?');
    const before = items.map((it) => {
      const row = readProv.get(it.runId, responseId.get(it.symbol) ?? -1) as { provenance: string | null } | undefined;
      return row?.provenance ? (JSON.parse(row.provenance) as Provenance) : null;
    });
    const result = applyRunEdits(
      db,
      actor,
      studyId,
      items.map((it) => ({ runId: it.runId, version: it.version, values: { [it.symbol]: it.text } })),
      { pathOf: (i) => (items.length > 1 ? `runs.${i}` : ''), source: opts.source, reason: opts.reason ?? null },
      setup,
    );
    const setProv = c.prepare('update run_values set provenance = ? where run_id = ? and response_id = ?');
    const bump = c.prepare('update runs set version = version + 1, updated_at = ? where id = ?');
    const insertAudit = c.prepare(
      "insert into audit_events (at, user_id, token_id, study_id, run_id, entity, entity_id, action, field, old_value, new_value, reason) values (?, ?, ?, ?, ?, 'run', ?, ?, ?, ?, ?, ?)",
    );
    const now = Date.now();
    items.forEach((it, i) => {
      if (it.text === null) return;
      const rid = responseId.get(it.symbol)!;
      setProv.run(it.provenance ? JSON.stringify(it.provenance) : null, it.runId, rid);
      const oldS = substance(before[i]!);
      const newS = substance(it.provenance);
      if (oldS === newS) return;
      insertAudit.run(now, actor.userId, actor.tokenId, studyId, it.runId, String(it.runId), opts.source, `provenance:${it.symbol}`, oldS, newS, opts.reason ?? null);
      // Only the provenance moved: the run still changed, so stale editors must be caught.
      if (!result.runIds.includes(it.runId)) {
        bump.run(now, it.runId);
        result.runIds.push(it.runId);
      }
    });
    return result;
  });
}

/** Runs of a study with every value's provenance, for the calculator pages. */
export function calcRunSummaries(db: Db, studyId: number, setupIn?: Setup, ids?: number[]): CalcRunSummary[] {
  const setup = setupIn ?? loadSetup(db, studyId);
  const runs = loadRuns(db, studyId, { setup, ids });
  const symbolOf = new Map(setup.responses.map((r) => [r.id, r.symbol]));
  const rows = db.$client
    .prepare('select v.run_id as runId, v.response_id as responseId, v.provenance from run_values v join runs r on r.id = v.run_id where r.study_id = ? and v.provenance is not null')
    .all(studyId) as { runId: number; responseId: number; provenance: string }[];
  const prov = new Map(rows.map((r) => [`${r.runId}:${symbolOf.get(r.responseId)}`, JSON.parse(r.provenance) as Provenance]));
  return runs.map((run) => {
    const values: Record<string, CalcRunValue> = {};
    for (const [sym, v] of Object.entries(run.values)) values[sym] = { text: v.text, value: v.value, provenance: prov.get(`${run.id}:${sym}`) ?? null };
    return { runId: run.id, code: run.code, version: run.version, excluded: run.excluded, settings: run.settings, values };
  });
}
