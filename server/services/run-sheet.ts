import type { Db } from '../db/client.js';
import { cachedStudyJson, type CachedJson } from './cached-json.js';
import { loadSetup, type ResponseRow, type Setup } from './study-setup.js';

/**
 * Reading the run sheet. One query per table (runs, values, measurements, attachment counts) and a
 * join in memory keyed by run id: 10 000 runs x a few responses serialise in tens of milliseconds,
 * where per-run queries would take seconds. The analysis (issue 5) reads runs through `loadRuns` too,
 * so both see the same `excluded` rule.
 */

import { encodeRunColumns, type CellValue, type Run, type SheetValue } from '../../shared/run-sheet.js';

export type { CellValue, Run, SheetValue };

/** Column order of the runs query, read with .raw() (arrays are cheaper than row objects at 10^4-10^5 rows). */
type RunRowRaw = [number, string, number, number, string, number, string, number | null, string, string, string, string, number | null, string | null, number, number];

export function isOutOfRange(r: Pick<ResponseRow, 'rangeMin' | 'rangeMax'>, value: number): boolean {
  return (r.rangeMin !== null && value < r.rangeMin) || (r.rangeMax !== null && value > r.rangeMax);
}

/**
 * Runs of a study in run order. `ids` restricts to those runs (for returning what an edit changed);
 * removed runs are left out unless asked for or named in `ids`.
 */
export function loadRuns(db: Db, studyId: number, opts: { includeRemoved?: boolean; ids?: number[]; setup?: Setup } = {}): Run[] {
  const setup = opts.setup ?? loadSetup(db, studyId);
  const idFilter = opts.ids ? ' and r.id in (select value from json_each(?))' : '';
  const removedFilter = opts.includeRemoved || opts.ids ? '' : ' and r.removed_at is null';
  const args: (number | string)[] = opts.ids ? [studyId, JSON.stringify(opts.ids)] : [studyId];
  const c = db.$client;
  const rows = c
    .prepare(
      `select r.id, r.code, r.standard_order, r.run_order, r.block, r.centre_point, r.settings, r.outcome_id, r.outcome_reason,
         r.operator, r.tested_on, r.notes, r.removed_at, r.removed_reason, r.version, r.updated_at
       from runs r where r.study_id = ?${idFilter}${removedFilter} order by r.run_order, r.id`,
    )
    .raw()
    .all(...args) as RunRowRaw[];
  const invalidOutcomes = new Set(setup.outcomes.filter((o) => !o.valid).map((o) => o.id));
  const byId = new Map<number, Run>();
  const out: Run[] = new Array<Run>(rows.length);
  for (let i = 0; i < rows.length; i++) {
    const [id, code, standardOrder, runOrder, block, centre, settings, outcomeId, outcomeReason, operator, testedOn, notes, removedAt, removedReason, version, updatedAt] = rows[i]!;
    // Built as one literal with a fixed shape: V8 keeps these objects fast, where spreads were the
    // largest cost of a 50 000-run load.
    const run: Run = {
      id, code, standardOrder, runOrder, block, centrePoint: centre === 1,
      settings: JSON.parse(settings) as Record<string, string>,
      measured: {}, values: {}, outcomeId, outcomeReason,
      excluded: removedAt !== null || (outcomeId !== null && invalidOutcomes.has(outcomeId)),
      operator, testedOn, notes, attachmentCount: 0, removedAt, removedReason, version, updatedAt,
    };
    byId.set(id, run);
    out[i] = run;
  }
  if (out.length === 0) return out;

  const responseById = new Map(setup.responses.map((x) => [x.id, x]));
  const factorById = new Map(setup.factors.map((x) => [x.id, x]));
  const joinFilter = opts.ids ? ' and r.id in (select value from json_each(?))' : '';
  const values = c
    .prepare(`select v.run_id as runId, v.response_id as responseId, v.text, v.value from run_values v join runs r on r.id = v.run_id where r.study_id = ?${joinFilter}`)
    .raw()
    .all(...args) as [number, number, string, number][];
  for (const [runId, responseId, text, value] of values) {
    const run = byId.get(runId);
    const resp = responseById.get(responseId);
    if (run && resp) run.values[resp.symbol] = { text, value, outOfRange: isOutOfRange(resp, value) };
  }
  const measured = c
    .prepare(`select m.run_id, m.factor_id, m.text, m.value from run_measurements m join runs r on r.id = m.run_id where r.study_id = ?${joinFilter}`)
    .raw()
    .all(...args) as [number, number, string, number][];
  for (const [runId, factorId, text, value] of measured) {
    const run = byId.get(runId);
    const f = factorById.get(factorId);
    if (run && f) run.measured[f.symbol] = { text, value };
  }
  const counts = c
    .prepare('select run_id, count(*) from attachments where study_id = ? and deleted_at is null and run_id is not null group by run_id')
    .raw()
    .all(studyId) as [number, number][];
  for (const [runId, n] of counts) {
    const run = byId.get(runId);
    if (run) run.attachmentCount = n;
  }
  return out;
}

export function runSheet(db: Db, studyId: number, includeRemoved: boolean) {
  const setup = loadSetup(db, studyId);
  const runs = loadRuns(db, studyId, { includeRemoved: true, setup });
  const live = runs.filter((r) => r.removedAt === null);
  const counts = {
    planned: live.length,
    recorded: live.filter((r) => Object.keys(r.values).length > 0).length,
    invalid: live.filter((r) => r.excluded).length,
    removed: runs.length - live.length,
  };
  return { studyId, ...setup, counts, runs: includeRemoved ? runs : live };
}

/** Room for about ten 10 000-run sheets (5.5 MB of JSON + ~0.7 MB gzip each). */
const RUN_SHEET_CACHE_BYTES = 64 * 2 ** 20;

/**
 * The serialised run sheet at the study's current data revision. It depends on the study's data
 * and `includeRemoved` only — the same for every member allowed to read it — so those are the key.
 */
export function cachedRunSheet(db: Db, studyId: number, includeRemoved: boolean, layout: 'rows' | 'columns' = 'rows'): CachedJson {
  return cachedStudyJson(db, 'run-sheet', RUN_SHEET_CACHE_BYTES, studyId, `${includeRemoved ? 'all' : 'live'}:${layout}`, () => {
    const sheet = runSheet(db, studyId, includeRemoved);
    return layout === 'columns' ? { ...sheet, runs: encodeRunColumns(sheet.runs) } : sheet;
  });
}
