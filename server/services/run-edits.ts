import { DECIMAL_RE } from '../../shared/studies.js';
import type { RunChange, RunFields } from '../../shared/runs.js';
import type { Db } from '../db/client.js';
import { HttpError } from '../http-error.js';
import type { Actor } from './actor.js';
import { AuditBatch } from './audit-batch.js';
import { isOutOfRange, loadRuns, type Run } from './run-sheet.js';
import { loadSetup, type Setup } from './study-setup.js';
import { autoAdvance, touchStudyTime } from './studies.js';

/**
 * The one place run values change: the sheet's per-cell PATCH, multi-cell paste (batch), import
 * commit and the scripted bulk push all call `applyRunEdits`. It validates every edit first, then
 * writes with prepared statements — so a 50 000-row import is one transaction of plain inserts —
 * and records one audit row per changed field. It must be called inside a transaction (the callers
 * wrap it), so that any error leaves nothing written.
 */

export interface EditInput extends RunFields {
  runId: number;
  /** Required where the caller promises optimistic concurrency (sheet, batch, push). */
  version?: number;
}

export interface EditOptions {
  reason?: string | null;
  /** Prefix for error paths: (i) => `edits.${i}` for batches, () => '' for a single PATCH. */
  pathOf: (index: number) => string;
  /** Where the change came from, stored as the audit action (sheet, batch, import, push). */
  source: string;
}

export interface EditResult {
  changes: RunChange[];
  runIds: number[];
  warnings: string[];
  /** Edits that restore the previous values, addressed at the new versions (one-step undo). */
  undo: EditInput[];
}

type Problem = { path: string; message: string };

const FIELD_KEYS = ['outcomeReason', 'operator', 'testedOn', 'notes'] as const;

function parseDecimal(text: string): number | null {
  if (!DECIMAL_RE.test(text)) return null;
  const n = Number(text);
  return Number.isFinite(n) ? n : null;
}

function decimalProblem(text: string): string {
  if (/^[+-]?\d+,\d+$/.test(text)) return `"${text}" uses a comma; use a point as the decimal mark`;
  if (DECIMAL_RE.test(text)) return `"${text}" is too large to be a finite number`;
  return `"${text}" is not a number`;
}

/**
 * `currentIn`: the study's runs by id as already read inside the caller's transaction (the import
 * commit has just validated against them), to save a second read of a 50 000-run sheet.
 */
export function applyRunEdits(db: Db, actor: Actor, studyId: number, edits: EditInput[], opts: EditOptions, setupIn?: Setup, currentIn?: Map<number, Run>): EditResult {
  const setup = setupIn ?? loadSetup(db, studyId);
  const responses = new Map(setup.responses.map((r) => [r.symbol, r]));
  const factors = new Map(setup.factors.map((f) => [f.symbol, f]));
  const outcomeIds = new Map(setup.outcomes.map((o) => [o.id, o]));
  const current = currentIn ?? loadCurrent(db, studyId, edits, setup);

  const problems: Problem[] = [];
  const seen = new Set<number>();
  edits.forEach((e, i) => {
    const p = opts.pathOf(i);
    const at = (k: string) => (p ? `${p}.${k}` : k);
    const run = current.get(e.runId);
    if (!run) {
      problems.push({ path: at('runId'), message: `Run ${e.runId} is not in this study` });
      return;
    }
    if (seen.has(e.runId)) problems.push({ path: at('runId'), message: `Run ${run.code} is edited twice in one request; merge the edits` });
    seen.add(e.runId);
    if (run.removedAt !== null) problems.push({ path: at('runId'), message: `Run ${run.code} was removed (${run.removedReason}); restore it before editing` });
    for (const [sym, text] of Object.entries(e.values ?? {})) {
      if (!responses.has(sym)) problems.push({ path: at(`values.${sym}`), message: `No response with symbol "${sym}"` });
      else if (text !== null && text.trim() !== '' && parseDecimal(text.trim()) === null) problems.push({ path: at(`values.${sym}`), message: `${sym}: ${decimalProblem(text.trim())}` });
    }
    for (const [sym, text] of Object.entries(e.measured ?? {})) {
      const f = factors.get(sym);
      if (!f) problems.push({ path: at(`measured.${sym}`), message: `No factor with symbol "${sym}"` });
      else if (!f.tracksMeasured) problems.push({ path: at(`measured.${sym}`), message: `Factor "${sym}" does not record measured values (switch on "tracks measured" in the set-up)` });
      else if (text !== null && text.trim() !== '' && parseDecimal(text.trim()) === null) problems.push({ path: at(`measured.${sym}`), message: `${sym}: ${decimalProblem(text.trim())}` });
    }
    if (e.outcomeId !== undefined && e.outcomeId !== null && !outcomeIds.has(e.outcomeId)) {
      problems.push({ path: at('outcomeId'), message: `Outcome ${e.outcomeId} is not one of this study's outcomes` });
    }
  });
  if (problems.length) {
    throw new HttpError(400, problems.slice(0, 5).map((x) => `${x.path}: ${x.message}`).join('; ') + (problems.length > 5 ? `; and ${problems.length - 5} more` : ''), { details: problems.slice(0, 500) });
  }
  // Concurrency after validation, so a 409 always means "valid edit, but someone was first".
  for (const e of edits) {
    const run = current.get(e.runId)!;
    if (e.version !== undefined && e.version !== run.version) {
      throw new HttpError(409, `Run ${run.code} was changed by someone else (now version ${run.version}, you edited version ${e.version}); the current values are shown`, { current: run });
    }
  }
  return write(db, actor, studyId, edits, current, setup, opts);
}

function loadCurrent(db: Db, studyId: number, edits: EditInput[], setup: Setup): Map<number, Run> {
  const ids = [...new Set(edits.map((e) => e.runId))];
  // Large edits (imports, pushes) read the whole sheet in one pass: cheaper than an id filter of 10^4+ ids.
  const loaded = ids.length > 1000 ? loadRuns(db, studyId, { includeRemoved: true, setup }) : loadRuns(db, studyId, { ids, setup });
  return new Map(loaded.map((r) => [r.id, r]));
}

function write(db: Db, actor: Actor, studyId: number, edits: EditInput[], current: Map<number, Run>, setup: Setup, opts: EditOptions): EditResult {
  const c = db.$client;
  const now = Date.now();
  const upsertValue = c.prepare(
    `insert into run_values (run_id, response_id, text, value, updated_at) values (?, ?, ?, ?, ?)
     on conflict (run_id, response_id) do update set text = excluded.text, value = excluded.value, provenance = null, updated_at = excluded.updated_at`,
  );
  const deleteValue = c.prepare('delete from run_values where run_id = ? and response_id = ?');
  const upsertMeasured = c.prepare(
    'insert into run_measurements (run_id, factor_id, text, value) values (?, ?, ?, ?) on conflict (run_id, factor_id) do update set text = excluded.text, value = excluded.value',
  );
  const deleteMeasured = c.prepare('delete from run_measurements where run_id = ? and factor_id = ?');
  const updateRun = c.prepare(
    'update runs set outcome_id = ?, outcome_reason = ?, operator = ?, tested_on = ?, notes = ?, version = version + 1, updated_at = ? where id = ?',
  );
  const auditRows = new AuditBatch(c);
  const responses = new Map(setup.responses.map((r) => [r.symbol, r]));
  const factors = new Map(setup.factors.map((f) => [f.symbol, f]));
  const outcomeLabel = new Map(setup.outcomes.map((o) => [o.id, o.label]));
  const result: EditResult = { changes: [], runIds: [], warnings: [], undo: [] };
  let anyValue = false;

  for (const e of edits) {
    const run = current.get(e.runId)!;
    const changes: RunChange[] = [];
    const undo: EditInput = { runId: run.id, version: run.version + 1 };
    const note = (field: string, oldValue: string | null, newValue: string | null) => {
      changes.push({ runId: run.id, code: run.code, field, oldValue, newValue });
      auditRows.add({ at: now, userId: actor.userId, tokenId: actor.tokenId, studyId, runId: run.id, entity: 'run', entityId: String(run.id), action: opts.source, field, oldValue, newValue, reason: opts.reason ?? null });
    };
    for (const [sym, raw] of Object.entries(e.values ?? {})) {
      const text = raw === null || raw.trim() === '' ? null : raw.trim();
      const old = run.values[sym]?.text ?? null;
      if (text === old) continue;
      const resp = responses.get(sym)!;
      if (text === null) deleteValue.run(run.id, resp.id);
      else {
        const value = parseDecimal(text)!;
        upsertValue.run(run.id, resp.id, text, value, now);
        anyValue = true;
        if (isOutOfRange(resp, value)) result.warnings.push(`${run.code} ${sym} = ${text} is outside the plausible range ${resp.rangeMin ?? '−∞'} … ${resp.rangeMax ?? '∞'} (kept and flagged)`);
      }
      (undo.values ??= {})[sym] = old;
      note(`value:${sym}`, old, text);
    }
    for (const [sym, raw] of Object.entries(e.measured ?? {})) {
      const text = raw === null || raw.trim() === '' ? null : raw.trim();
      const old = run.measured[sym]?.text ?? null;
      if (text === old) continue;
      const f = factors.get(sym)!;
      if (text === null) deleteMeasured.run(run.id, f.id);
      else upsertMeasured.run(run.id, f.id, text, parseDecimal(text)!);
      (undo.measured ??= {})[sym] = old;
      note(`measured:${sym}`, old, text);
    }
    const next = { outcomeId: run.outcomeId, outcomeReason: run.outcomeReason, operator: run.operator, testedOn: run.testedOn, notes: run.notes };
    if (e.outcomeId !== undefined && e.outcomeId !== run.outcomeId) {
      next.outcomeId = e.outcomeId;
      undo.outcomeId = run.outcomeId;
      note('outcome', run.outcomeId === null ? null : (outcomeLabel.get(run.outcomeId) ?? String(run.outcomeId)), e.outcomeId === null ? null : outcomeLabel.get(e.outcomeId)!);
    }
    for (const key of FIELD_KEYS) {
      const v = e[key];
      if (v === undefined || v === run[key]) continue;
      next[key] = v;
      undo[key] = run[key];
      note(key, run[key], v);
    }
    if (changes.length === 0) continue;
    // The version moves whenever anything of the run changed, values included, so stale cells are caught.
    updateRun.run(next.outcomeId, next.outcomeReason, next.operator, next.testedOn, next.notes, now, run.id);
    result.changes.push(...changes);
    result.runIds.push(run.id);
    result.undo.push(undo);
  }
  auditRows.flush(); // before the status change below audits, so ids keep the order of events
  if (result.runIds.length) touchStudyTime(db, studyId);
  if (anyValue) autoAdvance(db, actor, studyId, 'planned', 'collecting', 'first result recorded');
  return result;
}

/** Wraps applyRunEdits in its own transaction and returns the changed runs as the sheet shows them. */
export function editRuns(db: Db, actor: Actor, studyId: number, edits: EditInput[], opts: EditOptions) {
  const result = db.transaction(() => applyRunEdits(db, actor, studyId, edits, opts));
  return { ...result, runs: loadRuns(db, studyId, { ids: result.runIds }) };
}
