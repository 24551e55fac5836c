import { createHash } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { DECIMAL_RE } from '../../shared/studies.js';
import type { ImportMapping, ImportRowError } from '../../shared/runs.js';
import type { Db } from '../db/client.js';
import { imports } from '../db/schema.js';
import { conflict, notFound } from '../http-error.js';
import { audit } from './audit.js';
import { by, type Actor } from './actor.js';
import type { ParsedTable } from './import-parse.js';
import { applyRunEdits, type EditInput } from './run-edits.js';
import { loadRuns, type Run } from './run-sheet.js';
import { loadSetup, type Setup } from './study-setup.js';

/**
 * Import: upload -> preview (nothing written) -> commit (all rows in one transaction, or none).
 * The parsed table is kept with the import so the mapping can be changed and re-checked without a
 * new upload. Commit re-validates against the current sheet, so a run edited since the preview is
 * caught rather than overwritten blindly, and writes through the same run-edit service as the sheet.
 */

type ImportRow = typeof imports.$inferSelect;
interface Payload {
  headers: string[];
  rows: string[][];
}

const norm = (s: string) => s.toLowerCase().replace(/\s*[[(].*?[\])]\s*/g, ' ').replace(/[\s_-]+/g, ' ').trim();
const RUN_HEADERS = new Set(['run', 'run id', 'runid', 'run code', 'code', 'specimen', 'specimen id']);
const FIELD_HEADERS: Record<string, string> = {
  outcome: 'outcome', validity: 'outcome', 'outcome reason': 'outcomeReason', reason: 'outcomeReason',
  operator: 'operator', 'tested on': 'testedOn', date: 'testedOn', notes: 'notes', note: 'notes',
};

/** Guesses where each column goes from its header: run id, symbols or names, the run's text fields. */
export function autoMapping(setup: Setup, headers: string[]): ImportMapping {
  const columns: Record<string, string> = {};
  for (const h of headers) {
    if (h === '') continue;
    const n = norm(h);
    const f = setup.factors.find((x) => norm(x.symbol) === n || norm(x.name) === n);
    const m = setup.factors.find((x) => x.tracksMeasured && (n === `${norm(x.symbol)} measured` || n === `${norm(x.name)} measured`));
    const r = setup.responses.find((x) => norm(x.symbol) === n || norm(x.name) === n);
    columns[h] = RUN_HEADERS.has(n) ? 'run' : f ? `factor:${f.symbol}` : m ? `measured:${m.symbol}` : r ? `response:${r.symbol}` : (FIELD_HEADERS[n] ?? 'ignore');
  }
  return { columns };
}

export interface Validation {
  edits: EditInput[];
  rowOf: number[];
  errors: ImportRowError[];
  /** The sheet the rows were checked against (by id), for a commit in the same transaction. */
  runs: Map<number, Run>;
}

const sameLevel = (a: string, b: string, numeric: boolean) => (numeric && DECIMAL_RE.test(a) && DECIMAL_RE.test(b) ? Number(a) === Number(b) : a === b);

export function validateImport(db: Db, studyId: number, table: Payload, mapping: ImportMapping, setupIn?: Setup): Validation {
  const setup = setupIn ?? loadSetup(db, studyId);
  // Removed runs too: a row naming one gets a clear error, and the commit reuses this load.
  const loaded = loadRuns(db, studyId, { setup, includeRemoved: true });
  const runs = new Map(loaded.map((r) => [r.id, r]));
  const errors: ImportRowError[] = [];
  const err = (row: number, column: string | null, kind: ImportRowError['kind'], message: string) => errors.push({ row, column, kind, message });
  const col = (target: string) => table.headers.findIndex((h) => mapping.columns[h] === target);

  const responses = setup.responses.map((r) => ({ r, i: col(`response:${r.symbol}`) })).filter((x) => x.i >= 0);
  const measured = setup.factors.map((f) => ({ f, i: col(`measured:${f.symbol}`) })).filter((x) => x.i >= 0);
  const factorCols = setup.factors.map((f) => ({ f, i: col(`factor:${f.symbol}`) }));
  const runCol = col('run');
  const fields = (['outcomeReason', 'operator', 'testedOn', 'notes'] as const).map((k) => ({ k, i: col(k) })).filter((x) => x.i >= 0);
  const outcomeCol = col('outcome');

  for (const [header, target] of Object.entries(mapping.columns)) {
    if (!table.headers.includes(header)) err(0, header, 'bad-field', `The mapping names column "${header}", which is not in the file`);
    const [kind, sym] = target.split(':');
    if (sym && kind === 'response' && !setup.responses.some((r) => r.symbol === sym)) err(0, header, 'bad-field', `No response "${sym}" in this study`);
    if (sym && (kind === 'factor' || kind === 'measured') && !setup.factors.some((f) => f.symbol === sym)) err(0, header, 'bad-field', `No factor "${sym}" in this study`);
    if (kind === 'measured' && setup.factors.some((f) => f.symbol === sym && !f.tracksMeasured)) err(0, header, 'bad-field', `Factor "${sym}" does not record measured values`);
  }
  const bySettings = factorCols.every((x) => x.i >= 0) && setup.factors.length > 0;
  if (runCol < 0 && !bySettings) {
    err(0, null, 'missing-key', `Map a column to the run id, or map every factor (${setup.factors.map((f) => f.symbol).join(', ')}) so rows can find their runs`);
  }
  if (errors.length) return { edits: [], rowOf: [], errors, runs };

  const byCode = new Map(loaded.map((r) => [r.code.toLowerCase(), r]));
  const outcomeByLabel = new Map(setup.outcomes.map((o) => [o.label.toLowerCase(), o.id]));
  // Settings-matched rows fill the runs of that setting in run order, skipping runs already recorded.
  // Only built when rows are matched by settings (keys for 50 000 runs are not free).
  const freeBySetting = new Map<string, { ids: number[]; next: number }>();
  const settingKey = (s: Record<string, string>) => setup.factors.map((f) => (f.kind === 'numeric' ? String(Number(s[f.symbol])) : s[f.symbol])).join('\u0001');
  const plannedSettings = new Set<string>();
  for (const r of runCol >= 0 ? [] : loaded) {
    if (r.removedAt !== null) continue;
    plannedSettings.add(settingKey(r.settings));
    if (Object.keys(r.values).length > 0) continue;
    const k = settingKey(r.settings);
    const slot = freeBySetting.get(k);
    if (slot) slot.ids.push(r.id);
    else freeBySetting.set(k, { ids: [r.id], next: 0 });
  }
  const taken = new Map<number, number>();
  const edits: EditInput[] = [];
  const rowOf: number[] = [];

  table.rows.forEach((cells, idx) => {
    const row = idx + 1;
    const at = (i: number) => (cells[i] ?? '').trim();
    const before = errors.length;
    const settings: Record<string, string> = {};
    for (const { f, i } of factorCols) {
      if (i < 0) continue;
      const v = at(i);
      const level = f.levels.find((l) => sameLevel(l.value, v, f.kind === 'numeric'));
      if (!level) err(row, table.headers[i]!, 'unknown-level', `"${v}" is not a level of ${f.symbol} (levels: ${f.levels.map((l) => l.value).join(', ')})`);
      else settings[f.symbol] = level.value;
    }
    let runId: number | undefined;
    if (runCol >= 0) {
      const code = at(runCol);
      const run = byCode.get(code.toLowerCase());
      if (!code) err(row, table.headers[runCol]!, 'unmatched-run', 'The run id is empty');
      else if (!run) err(row, table.headers[runCol]!, 'unmatched-run', `Run "${code}" is not in this study's plan`);
      else if (run.removedAt !== null) err(row, table.headers[runCol]!, 'unmatched-run', `Run "${code}" was removed (${run.removedReason})`);
      else {
        runId = run.id;
        for (const [sym, value] of Object.entries(settings)) {
          if (run.settings[sym] !== value) err(row, sym, 'unmatched-run', `Run ${run.code} was planned with ${sym} = ${run.settings[sym]}, the row says ${value}`);
        }
      }
    } else if (errors.length === before) {
      const key = settingKey(settings);
      const free = freeBySetting.get(key);
      const described = setup.factors.map((f) => `${f.symbol}=${settings[f.symbol]}`).join(', ');
      if (!plannedSettings.has(key)) err(row, null, 'unmatched-run', `No run of the plan has the settings ${described}`);
      else if (!free || free.next >= free.ids.length) err(row, null, 'duplicate-run', `More rows than unrecorded runs for the settings ${described}`);
      else runId = free.ids[free.next++];
    }
    if (runId !== undefined) {
      const first = taken.get(runId);
      if (first !== undefined) err(row, runCol >= 0 ? table.headers[runCol]! : null, 'duplicate-run', `Run ${runs.get(runId)?.code} already appears in row ${first}`);
      else taken.set(runId, row);
    }
    const edit: EditInput = { runId: runId ?? 0 };
    for (const { r, i } of responses) {
      const v = at(i);
      if (v === '') continue;
      if (!DECIMAL_RE.test(v) || !Number.isFinite(Number(v))) err(row, table.headers[i]!, 'non-numeric', `${r.symbol}: "${v}" is not a number${/^[+-]?\d+,\d+$/.test(v) ? ' (use a point as the decimal mark)' : ''}`);
      else (edit.values ??= {})[r.symbol] = v;
    }
    for (const { f, i } of measured) {
      const v = at(i);
      if (v === '') continue;
      if (!DECIMAL_RE.test(v) || !Number.isFinite(Number(v))) err(row, table.headers[i]!, 'non-numeric', `${f.symbol} measured: "${v}" is not a number`);
      else (edit.measured ??= {})[f.symbol] = v;
    }
    if (outcomeCol >= 0 && at(outcomeCol) !== '') {
      const id = outcomeByLabel.get(at(outcomeCol).toLowerCase());
      if (id === undefined) err(row, table.headers[outcomeCol]!, 'unknown-outcome', `"${at(outcomeCol)}" is not one of the outcomes (${setup.outcomes.map((o) => o.label).join(', ')})`);
      else edit.outcomeId = id;
    }
    for (const { k, i } of fields) {
      const v = at(i);
      if (v === '') continue;
      if (k === 'testedOn' && !/^\d{4}-\d{2}-\d{2}$/.test(v)) err(row, table.headers[i]!, 'bad-field', `"${v}" is not a date like 2026-03-14`);
      else if (v.length > (k === 'notes' ? 4000 : 1000)) err(row, table.headers[i]!, 'bad-field', `${k}: ${v.length} characters is too long`);
      else edit[k] = v;
    }
    if (errors.length === before && runId !== undefined) {
      edits.push(edit);
      rowOf.push(row);
    }
  });
  return { edits, rowOf, errors, runs };
}

function toPreview(row: ImportRow, v: Validation, runs: Map<number, string>) {
  const payload = row.payload as unknown as Payload;
  return {
    id: row.id,
    fileName: row.fileName,
    status: row.status,
    rowCount: row.rowCount,
    errorCount: v.errors.length,
    headers: payload.headers,
    mapping: row.mapping as ImportMapping,
    errors: v.errors.slice(0, 500),
    sample: v.edits.slice(0, 20).map((e, i) => ({ row: v.rowOf[i], runCode: runs.get(e.runId) ?? '', changes: e })),
    createdAt: row.createdAt,
    committedAt: row.committedAt,
  };
}

function runCodes(db: Db, studyId: number): Map<number, string> {
  return new Map((db.$client.prepare('select id, code from runs where study_id = ?').raw().all(studyId) as [number, string][]).map(([id, code]) => [id, code]));
}

export function createImport(db: Db, actor: Actor, studyId: number, file: { name: string; buffer: Buffer }, table: ParsedTable, mapping?: ImportMapping) {
  const setup = loadSetup(db, studyId);
  const map = mapping ?? autoMapping(setup, table.headers);
  const v = validateImport(db, studyId, table, map, setup);
  const row = db
    .insert(imports)
    .values({
      studyId, userId: actor.userId, fileName: file.name, sha256: createHash('sha256').update(file.buffer).digest('hex'),
      mapping: map, payload: table as unknown as Record<string, unknown>, rowCount: table.rows.length, errorCount: v.errors.length,
    })
    .returning()
    .get();
  return toPreview(row, v, runCodes(db, studyId));
}

function importRow(db: Db, studyId: number, importId: number): ImportRow {
  const row = db.select().from(imports).where(and(eq(imports.id, importId), eq(imports.studyId, studyId))).get();
  if (!row) throw notFound(`Import ${importId} of this study`);
  return row;
}

export function getImport(db: Db, studyId: number, importId: number) {
  const row = importRow(db, studyId, importId);
  // Only an open preview is re-checked; a committed import's rows are now the sheet's own values.
  const v = row.status === 'preview' ? validateImport(db, studyId, row.payload as unknown as Payload, row.mapping as ImportMapping) : { edits: [], rowOf: [], errors: [], runs: new Map<number, Run>() };
  return toPreview(row, v, runCodes(db, studyId));
}

export function remapImport(db: Db, studyId: number, importId: number, mapping: ImportMapping) {
  const row = importRow(db, studyId, importId);
  if (row.status !== 'preview') throw conflict(`Import ${importId} is already ${row.status}`);
  const v = validateImport(db, studyId, row.payload as unknown as Payload, mapping);
  const next = db.update(imports).set({ mapping, errorCount: v.errors.length }).where(eq(imports.id, importId)).returning().get();
  return toPreview(next, v, runCodes(db, studyId));
}

// A 50 000-row commit dirties ~30 MB of pages (runs, values, audit rows and their indexes). With
// SQLite's default 16 MB page cache they spill to the WAL and are read back mid-transaction, which
// cost ~30 % of the commit time; the cache is raised for the commit only and given back after.
const COMMIT_CACHE_KIB = 64 * 1024;

function withLargePageCache<T>(db: Db, work: () => T): T {
  const c = db.$client;
  const before = c.pragma('cache_size', { simple: true }) as number;
  // negative cache_size = KiB, positive = pages; compare in KiB (pages of 4 KiB)
  const beforeKib = before < 0 ? -before : before * 4;
  if (beforeKib >= COMMIT_CACHE_KIB) return work();
  c.pragma(`cache_size = -${COMMIT_CACHE_KIB}`);
  try {
    return work();
  } finally {
    c.pragma(`cache_size = ${before}`);
  }
}

export function commitImport(db: Db, actor: Actor, studyId: number, importId: number) {
  const result = withLargePageCache(db, () => db.transaction((tx) => {
    const row = importRow(db, studyId, importId);
    if (row.status !== 'preview') throw conflict(`Import ${importId} is already ${row.status}; upload the file again to import it anew`);
    const setup = loadSetup(tx, studyId);
    const v = validateImport(db, studyId, row.payload as unknown as Payload, row.mapping as ImportMapping, setup);
    if (v.errors.length) {
      throw conflict(`Import ${importId} still has ${v.errors.length} row errors; nothing was written. Fix the file or the mapping and preview again`, { errors: v.errors.slice(0, 500) });
    }
    // The sheet validateImport read inside this transaction is the current one: no second load.
    const edits = applyRunEdits(db, actor, studyId, v.edits, { pathOf: (i) => `row ${v.rowOf[i]}`, source: 'import', reason: `import #${importId} (${row.fileName})` }, setup, v.runs);
    const done = tx.update(imports).set({ status: 'committed', committedAt: Date.now(), errorCount: 0 }).where(eq(imports.id, importId)).returning().get();
    audit(tx, { ...by(actor), studyId, entity: 'import', entityId: String(importId), action: 'commit', newValue: JSON.stringify({ file: row.fileName, sha256: row.sha256, rows: row.rowCount, runs: edits.runIds.length, values: edits.changes.length }) });
    return { row: done, v, changed: { runs: edits.runIds.length, values: edits.changes.length } };
  }));
  return { import: toPreview(result.row, result.v, runCodes(db, studyId)), changed: result.changed };
}

export function discardImport(db: Db, actor: Actor, studyId: number, importId: number) {
  const row = importRow(db, studyId, importId);
  if (row.status !== 'preview') throw conflict(`Import ${importId} is already ${row.status}`);
  db.transaction((tx) => {
    tx.update(imports).set({ status: 'discarded' }).where(eq(imports.id, importId)).run();
    audit(tx, { ...by(actor), studyId, entity: 'import', entityId: String(importId), action: 'discard', newValue: row.fileName });
  });
  return { id: importId, status: 'discarded' as const };
}
