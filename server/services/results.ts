import { and, eq } from 'drizzle-orm';
import { createHash } from 'node:crypto';
import type { ResultItem, ResultPushResponse } from '../../shared/results.js';
import { DECIMAL_RE } from '../../shared/studies.js';
import type { Db } from '../db/client.js';
import { idempotencyKeys } from '../db/schema.js';
import { HttpError } from '../http-error.js';
import type { Actor } from './actor.js';
import { audit } from './audit.js';
import { by } from './actor.js';
import { applyRunEdits, type EditInput } from './run-edits.js';
import { loadRuns, type Run } from './run-sheet.js';
import { loadSetup, type Setup } from './study-setup.js';

/**
 * Bulk result push. The rules are the run sheet's, through the same `applyRunEdits`: values are
 * validated as decimal text, one audit row per changed field (action "push", with the token id),
 * all-or-nothing in one transaction. Two additions for unattended scripts:
 *  - idempotency (after the IETF draft "The Idempotency-Key HTTP Header Field"): the first
 *    successful response is stored under the client's key; the same key with the same body gets
 *    that response again and changes nothing; the same key with a different body is 422;
 *  - a push without `version` may fill empty fields only — changing a recorded value needs the
 *    version the script read, so a script can never silently overwrite what a person typed (409).
 */

export interface PushOutcome {
  replayed: boolean;
  response: ResultPushResponse;
}

type Problem = { path: string; message: string };

/** JSON with object keys sorted, so that key order does not make two equal bodies differ. */
function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonical(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

export function requestHash(items: ResultItem[], reason: string | undefined): string {
  return createHash('sha256').update(canonical({ items, reason: reason ?? null })).digest('hex');
}

const asText = (v: string | number | null): string | null => (v === null ? null : typeof v === 'number' ? String(v) : v);

function sameLevel(a: string, b: string): boolean {
  if (a === b) return true;
  // "0.5" and "0.50" name the same numeric level.
  return DECIMAL_RE.test(a) && DECIMAL_RE.test(b) && Number(a) === Number(b);
}

/** Finds the run of every item; problems are collected for one 400 that lists them all. */
function resolveRuns(items: ResultItem[], runs: Run[], setup: Setup, problems: Problem[]): (Run | undefined)[] {
  const byId = new Map(runs.map((r) => [r.id, r]));
  const byCode = new Map(runs.map((r) => [r.code.toLowerCase(), r]));
  const claimed = new Set<number>();
  const factorSymbols = setup.factors.map((f) => f.symbol);
  return items.map((item, i) => {
    if (item.runId !== undefined) {
      const run = typeof item.runId === 'number' ? byId.get(item.runId) : byCode.get(item.runId.toLowerCase());
      if (!run) problems.push({ path: `${i}.runId`, message: `Run ${JSON.stringify(item.runId)} is not in this study` });
      else claimed.add(run.id);
      return run;
    }
    const settings = Object.fromEntries(Object.entries(item.settings ?? {}).map(([k, v]) => [k, String(v)]));
    const before = problems.length;
    for (const sym of Object.keys(settings)) if (!factorSymbols.includes(sym)) problems.push({ path: `${i}.settings.${sym}`, message: `No factor with symbol "${sym}"` });
    for (const f of setup.factors) {
      const given = settings[f.symbol];
      if (given === undefined) problems.push({ path: `${i}.settings.${f.symbol}`, message: `settings must name every factor; ${f.symbol} is missing` });
      else if (!f.levels.some((l) => sameLevel(l.value, given))) {
        problems.push({ path: `${i}.settings.${f.symbol}`, message: `"${given}" is not a level of ${f.symbol} (levels: ${f.levels.map((l) => l.value).join(', ')})` });
      }
    }
    if (problems.length > before) return undefined;
    const matching = runs.filter((r) => r.removedAt === null && setup.factors.every((f) => sameLevel(r.settings[f.symbol] ?? '', settings[f.symbol]!)));
    // Replicates: fill the first run (in run order) that has no values yet and is not taken by this push.
    const free = matching.find((r) => !claimed.has(r.id) && Object.keys(r.values).length === 0);
    if (!free) {
      const text = setup.factors.map((f) => `${f.symbol}=${settings[f.symbol]}`).join(', ');
      problems.push({ path: `${i}.settings`, message: matching.length ? `All ${matching.length} runs with ${text} already have results (or are named earlier in this push); give runId to change one` : `No run has the settings ${text}` });
      return undefined;
    }
    claimed.add(free.id);
    return free;
  });
}

/** Fields a version-less item would change although something is recorded there already. */
function overwrites(item: ResultItem, edit: EditInput, run: Run): string[] {
  const out: string[] = [];
  for (const [sym, text] of Object.entries(edit.values ?? {})) {
    const old = run.values[sym]?.text ?? null;
    const next = text === null || text.trim() === '' ? null : text.trim();
    if (old !== null && old !== next) out.push(`values.${sym} (recorded ${old})`);
  }
  if (edit.outcomeId !== undefined && run.outcomeId !== null && edit.outcomeId !== run.outcomeId) out.push('outcome');
  for (const key of ['notes', 'outcomeReason', 'operator', 'testedOn'] as const) {
    if (item[key] !== undefined && run[key] !== '' && run[key] !== item[key]) out.push(key);
  }
  return out;
}

export function pushResults(db: Db, actor: Actor, studyId: number, key: string, items: ResultItem[], reason?: string): PushOutcome {
  const hash = requestHash(items, reason);
  return db.transaction((tx) => {
    const stored = tx.select().from(idempotencyKeys).where(and(eq(idempotencyKeys.studyId, studyId), eq(idempotencyKeys.key, key))).get();
    if (stored) {
      if (stored.requestHash !== hash || stored.userId !== actor.userId) {
        throw new HttpError(422, `The idempotency key "${key}" was already used for a different push to this study; use a new key for new results`);
      }
      return { replayed: true, response: JSON.parse(stored.responseJson) as ResultPushResponse };
    }

    const setup = loadSetup(tx, studyId);
    const runs = loadRuns(db, studyId, { includeRemoved: true, setup });
    const problems: Problem[] = [];
    const targets = resolveRuns(items, runs, setup, problems);
    const outcomeByLabel = new Map(setup.outcomes.map((o) => [o.label.toLowerCase(), o.id]));
    const edits: EditInput[] = items.map((item, i) => {
      let outcomeId: number | null | undefined;
      if (item.outcome === null) outcomeId = null;
      else if (item.outcome !== undefined) {
        outcomeId = outcomeByLabel.get(item.outcome.toLowerCase());
        if (outcomeId === undefined) problems.push({ path: `${i}.outcome`, message: `"${item.outcome}" is not one of this study's outcomes (${setup.outcomes.map((o) => o.label).join(', ')})` });
      }
      const values = item.values ? Object.fromEntries(Object.entries(item.values).map(([k, v]) => [k, asText(v)])) : undefined;
      return {
        runId: targets[i]?.id ?? 0,
        version: item.version,
        values,
        outcomeId,
        outcomeReason: item.outcomeReason,
        notes: item.notes,
        operator: item.operator,
        testedOn: item.testedOn,
      };
    });
    if (problems.length) {
      throw new HttpError(400, problems.slice(0, 5).map((p) => `${p.path}: ${p.message}`).join('; ') + (problems.length > 5 ? `; and ${problems.length - 5} more` : ''), { details: problems.slice(0, 500) });
    }
    items.forEach((item, i) => {
      const run = targets[i]!;
      if (item.version !== undefined) return;
      const clash = overwrites(item, edits[i]!, run);
      if (clash.length) {
        throw new HttpError(409, `Result ${i} would change what is already recorded for run ${run.code}: ${clash.join(', ')}. Send the run's version (now ${run.version}) to overwrite`, { current: run });
      }
    });

    const result = applyRunEdits(db, actor, studyId, edits, { pathOf: (i) => String(i), source: 'push', reason: reason ?? null }, setup);
    const after = new Map(loadRuns(db, studyId, { ids: [...new Set(edits.map((e) => e.runId))], setup }).map((r) => [r.id, r]));
    const changedPerRun = new Map<number, number>();
    for (const c of result.changes) changedPerRun.set(c.runId, (changedPerRun.get(c.runId) ?? 0) + 1);
    const response: ResultPushResponse = {
      studyId,
      idempotencyKey: key,
      results: edits.map((e, index) => {
        const run = after.get(e.runId)!;
        return { index, runId: run.id, code: run.code, version: run.version, changed: changedPerRun.get(run.id) ?? 0 };
      }),
      changed: { runs: result.runIds.length, fields: result.changes.length },
      warnings: result.warnings,
    };
    tx.insert(idempotencyKeys).values({ key, studyId, userId: actor.userId, requestHash: hash, responseJson: JSON.stringify(response) }).run();
    audit(tx, { ...by(actor), studyId, entity: 'results-push', entityId: key, action: 'push', newValue: `${items.length} results, ${result.changes.length} fields changed`, reason: reason ?? null });
    return { replayed: false, response };
  });
}
