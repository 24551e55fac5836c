import { createHash } from 'node:crypto';
import type { AnalysisSpec, DataChanges, RunCounts, SnapshotRow } from '../../shared/analysis.js';
import type { Db } from '../db/client.js';
import { HttpError } from '../http-error.js';
import type { DbOrTx } from './audit.js';
import { loadSetup, type FactorRow, type ResponseRow } from './study-setup.js';

/**
 * The runs an analysis uses, chosen from the run sheet in one pass, and the data hash that freezes
 * them. Five queries whatever the study size (factors, responses, outcomes, runs, values of the
 * response): the preview must answer within a second for thousands of runs.
 */

export const DATA_FORMAT = 'specimetry.analysis-data.v1';

export interface AnalysisData {
  response: ResponseRow;
  factors: FactorRow[];
  /** the runs used, sorted by run id (the hash's order and the engine's input order) */
  rows: SnapshotRow[];
  counts: RunCounts;
  /** level order per chosen factor, restricted to the levels present among the used runs */
  levels: Record<string, string[]>;
  /** for every run not used: why (for "what changed since") */
  notUsed: Map<number, string>;
  /** study-wide outcome labels by id */
  outcomeLabels: Map<number, string>;
}

interface RunRow {
  id: number;
  code: string;
  settings: string;
  outcomeId: number | null;
  removedAt: number | null;
  centrePoint: number;
}

function pickSetup(db: DbOrTx, studyId: number, spec: Pick<AnalysisSpec, 'response' | 'factors'>) {
  const setup = loadSetup(db, studyId);
  const response = setup.responses.find((r) => r.symbol === spec.response);
  if (!response) {
    const known = setup.responses.map((r) => r.symbol).join(', ') || 'none yet';
    throw new HttpError(400, `response "${spec.response}" is not a response of this study (known: ${known})`, { details: [{ path: 'response', message: 'Unknown response' }] });
  }
  const factors = spec.factors.map((sym, i) => {
    const f = setup.factors.find((x) => x.symbol === sym);
    if (!f) {
      const known = setup.factors.map((x) => x.symbol).join(', ') || 'none yet';
      throw new HttpError(400, `factor "${sym}" is not a factor of this study (known: ${known})`, { details: [{ path: `factors.${i}`, message: 'Unknown factor' }] });
    }
    return f;
  });
  return { setup, response, factors };
}

/**
 * Sorts every run of the study into exactly one bucket (removed, centre point, excluded invalid,
 * missing value, used) — in that order, as documented in docs/api-analysis.md — and returns the used
 * ones with their values as entered.
 */
export function loadAnalysisData(db: Db, studyId: number, spec: Pick<AnalysisSpec, 'response' | 'factors' | 'excludeInvalid'>): AnalysisData {
  const { setup, response, factors } = pickSetup(db, studyId, spec);
  const valid = new Map(setup.outcomes.map((o) => [o.id, o.valid]));
  const outcomeLabels = new Map(setup.outcomes.map((o) => [o.id, o.label]));
  const runRows = db.$client
    .prepare('select id, code, settings, outcome_id as outcomeId, removed_at as removedAt, centre_point as centrePoint from runs where study_id = ? order by id')
    .all(studyId) as RunRow[];
  const values = new Map(
    (db.$client.prepare('select run_id as runId, text from run_values where response_id = ?').all(response.id) as { runId: number; text: string }[]).map((v) => [v.runId, v.text]),
  );
  const counts: RunCounts = { total: runRows.length, used: 0, removed: 0, centrePoints: 0, excludedInvalid: 0, byReason: [], invalidIncluded: 0, missingValue: 0 };
  const byReason = new Map<string, number>();
  const notUsed = new Map<number, string>();
  const rows: SnapshotRow[] = [];
  const present = factors.map(() => new Set<string>());
  for (const run of runRows) {
    const outcome = run.outcomeId === null ? null : (outcomeLabels.get(run.outcomeId) ?? null);
    const invalid = run.outcomeId !== null && valid.get(run.outcomeId) === false;
    const value = values.get(run.id);
    if (run.removedAt !== null) {
      counts.removed++;
      notUsed.set(run.id, 'run removed');
    } else if (run.centrePoint) {
      counts.centrePoints++;
      notUsed.set(run.id, 'centre point');
    } else if (invalid && spec.excludeInvalid) {
      counts.excludedInvalid++;
      byReason.set(outcome!, (byReason.get(outcome!) ?? 0) + 1);
      notUsed.set(run.id, `now invalid: ${outcome}`);
    } else if (value === undefined || value.trim() === '') {
      counts.missingValue++;
      notUsed.set(run.id, 'value cleared');
    } else {
      if (invalid) counts.invalidIncluded++;
      const all = JSON.parse(run.settings) as Record<string, string>;
      const settings: Record<string, string> = {};
      factors.forEach((f, i) => {
        const level = all[f.symbol];
        if (level === undefined) throw new HttpError(400, `run ${run.code} has no setting for factor "${f.symbol}"`);
        settings[f.symbol] = level;
        present[i]!.add(level);
      });
      rows.push({ runId: run.id, code: run.code, settings, value, outcome });
    }
  }
  counts.used = rows.length;
  counts.byReason = [...byReason].map(([outcomeLabel, count]) => ({ outcome: outcomeLabel, count })).sort((a, b) => b.count - a.count || a.outcome.localeCompare(b.outcome));
  // Levels in the study's order; levels nobody ran (or all runs excluded) are left out so the engine
  // reports "fewer than two levels" rather than "a level with no data" for a level that was dropped.
  const levels: Record<string, string[]> = {};
  factors.forEach((f, i) => {
    const known = f.levels.map((l) => l.value);
    const extra = [...present[i]!].filter((l) => !known.includes(l));
    levels[f.symbol] = [...known.filter((l) => present[i]!.has(l)), ...extra];
  });
  return { response, factors, rows, counts, levels, notUsed, outcomeLabels };
}

/**
 * RFC 8785 (JCS) canonical JSON for the values the data hash covers (strings, integers, null,
 * booleans, arrays, plain objects): keys sorted by UTF-16 code units, no whitespace, ECMAScript
 * string escaping — which is exactly JSON.stringify once the keys are in order.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    if (typeof value === 'number' && !Number.isFinite(value)) throw new RangeError(`canonicalJson: ${value} has no JSON form`);
    return JSON.stringify(value);
  }
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
  // Default sort compares UTF-16 code units, which is what JCS prescribes.
  entries.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
}

/** The document whose canonical JSON is hashed (see "The data hash" in docs/api-analysis.md). */
export function hashDocument(studyId: number, spec: Pick<AnalysisSpec, 'response' | 'factors'>, rows: SnapshotRow[]) {
  return { factors: spec.factors, format: DATA_FORMAT, response: spec.response, rows, studyId };
}

export function dataHash(studyId: number, spec: Pick<AnalysisSpec, 'response' | 'factors'>, rows: SnapshotRow[]): string {
  return createHash('sha256').update(canonicalJson(hashDocument(studyId, spec, rows)), 'utf8').digest('hex');
}

/** What changed between the frozen rows and today's selection, run by run. */
export function diffRows(before: SnapshotRow[], now: SnapshotRow[], notUsed: Map<number, string>): DataChanges {
  const old = new Map(before.map((r) => [r.runId, r]));
  const cur = new Map(now.map((r) => [r.runId, r]));
  const changes: DataChanges = { added: [], removed: [], edited: [] };
  for (const r of now) if (!old.has(r.runId)) changes.added.push({ runId: r.runId, code: r.code, value: r.value });
  for (const r of before) {
    const c = cur.get(r.runId);
    if (!c) {
      changes.removed.push({ runId: r.runId, code: r.code, value: r.value, why: notUsed.get(r.runId) ?? 'run no longer exists' });
      continue;
    }
    const edit = (field: string, a: string | null, b: string | null) => {
      if (a !== b) changes.edited.push({ runId: r.runId, code: r.code, field, oldValue: a, newValue: b });
    };
    edit('value', r.value, c.value);
    edit('outcome', r.outcome, c.outcome);
    for (const key of new Set([...Object.keys(r.settings), ...Object.keys(c.settings)])) edit(`setting:${key}`, r.settings[key] ?? null, c.settings[key] ?? null);
    if (r.code !== c.code) edit('code', r.code, c.code);
  }
  return changes;
}
