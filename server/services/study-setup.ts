import { asc, eq, inArray } from 'drizzle-orm';
import type { FactorInput, FactorsBody, OutcomesBody, ResponseInput, ResponsesBody } from '../../shared/studies.js';
import type { Db } from '../db/client.js';
import { factors, outcomes, responses, runs } from '../db/schema.js';
import { conflict, HttpError } from '../http-error.js';
import { audit, type DbOrTx } from './audit.js';
import { by, type Actor } from './actor.js';
import { touchStudy } from './studies.js';

export type FactorRow = typeof factors.$inferSelect;
export type ResponseRow = typeof responses.$inferSelect;
export type OutcomeRow = typeof outcomes.$inferSelect;

export interface Setup {
  factors: FactorRow[];
  responses: ResponseRow[];
  outcomes: OutcomeRow[];
}

export function loadSetup(db: DbOrTx, studyId: number): Setup {
  return {
    factors: db.select().from(factors).where(eq(factors.studyId, studyId)).orderBy(asc(factors.position)).all(),
    responses: db.select().from(responses).where(eq(responses.studyId, studyId)).orderBy(asc(responses.position)).all(),
    outcomes: db.select().from(outcomes).where(eq(outcomes.studyId, studyId)).orderBy(asc(outcomes.position)).all(),
  };
}

function hasRuns(db: DbOrTx, studyId: number): boolean {
  return db.select({ id: runs.id }).from(runs).where(eq(runs.studyId, studyId)).limit(1).all().length > 0;
}

/** Items with an id must be this study's own; returns the existing rows by id. */
function checkIds<T extends { id: number }>(existing: T[], items: { id?: number }[], what: string, key: string): Map<number, T> {
  const byId = new Map(existing.map((e) => [e.id, e]));
  items.forEach((it, i) => {
    if (it.id !== undefined && !byId.has(it.id)) {
      throw new HttpError(400, `${key}.${i}.id: ${what} ${it.id} does not belong to this study`, { details: [{ path: `${key}.${i}.id`, message: 'Unknown id' }] });
    }
  });
  return byId;
}

const factorDesign = (f: Pick<FactorInput, 'symbol' | 'kind' | 'levels'>) => JSON.stringify([f.symbol, f.kind, f.levels.map((l) => l.value)]);

/**
 * Replaces the factor list. Before a plan exists anything goes; once runs exist their settings refer
 * to factor symbols and level values, so only descriptive fields may change.
 */
export function putFactors(db: Db, actor: Actor, studyId: number, body: FactorsBody): FactorRow[] {
  db.transaction((tx) => {
    const existing = loadSetup(tx, studyId).factors;
    const byId = checkIds(existing, body.factors, 'factor', 'factors');
    if (hasRuns(tx, studyId)) {
      const sameSet = body.factors.length === existing.length && body.factors.every((f) => f.id !== undefined);
      const sameDesign = sameSet && body.factors.every((f) => factorDesign(f) === factorDesign(byId.get(f.id!)!));
      if (!sameDesign) {
        throw conflict('The plan has runs: factors, their symbols, kinds and level values are fixed now. Names, units, level labels and "tracks measured" can still change; to change the design, regenerate the plan while no run holds results');
      }
      for (const f of body.factors) {
        if (byId.get(f.id!)!.tracksMeasured && !f.tracksMeasured) {
          const used = db.$client.prepare('select count(*) as n from run_measurements where factor_id = ?').get(f.id) as { n: number };
          if (used.n > 0) throw conflict(`Factor "${f.symbol}" has ${used.n} measured values; it must keep tracking measured values`);
        }
      }
    }
    const keep = new Set(body.factors.map((f) => f.id).filter((id): id is number => id !== undefined));
    const gone = existing.filter((e) => !keep.has(e.id));
    if (gone.length) tx.delete(factors).where(inArray(factors.id, gone.map((g) => g.id))).run();
    for (const g of gone) audit(tx, { ...by(actor), studyId, entity: 'factor', entityId: String(g.id), action: 'delete', oldValue: JSON.stringify(g) });
    // Two passes so that swapping two symbols does not trip the unique (study, symbol) index.
    for (const f of body.factors) if (f.id !== undefined) tx.update(factors).set({ symbol: `__${f.id}` }).where(eq(factors.id, f.id)).run();
    body.factors.forEach((f, position) => {
      const { id, ...fields } = f;
      if (id === undefined) {
        const row = tx.insert(factors).values({ ...fields, studyId, position }).returning().get();
        audit(tx, { ...by(actor), studyId, entity: 'factor', entityId: String(row.id), action: 'create', newValue: JSON.stringify(fields) });
      } else {
        tx.update(factors).set({ ...fields, position }).where(eq(factors.id, id)).run();
        const before = byId.get(id)!;
        const old = JSON.stringify(pick(before, fields));
        if (old !== JSON.stringify(fields)) audit(tx, { ...by(actor), studyId, entity: 'factor', entityId: String(id), action: 'update', oldValue: old, newValue: JSON.stringify(fields) });
      }
    });
    touchStudy(tx, studyId);
  });
  return loadSetup(db, studyId).factors;
}

export function putResponses(db: Db, actor: Actor, studyId: number, body: ResponsesBody): ResponseRow[] {
  db.transaction((tx) => {
    const existing = loadSetup(tx, studyId).responses;
    const byId = checkIds(existing, body.responses, 'response', 'responses');
    const keep = new Set(body.responses.map((r) => r.id).filter((id): id is number => id !== undefined));
    const gone = existing.filter((e) => !keep.has(e.id));
    for (const g of gone) {
      const used = db.$client.prepare('select count(*) as n from run_values where response_id = ?').get(g.id) as { n: number };
      if (used.n > 0) throw conflict(`Response "${g.symbol}" has ${used.n} recorded values and cannot be deleted; keep it (values are never deleted silently)`);
    }
    if (gone.length) tx.delete(responses).where(inArray(responses.id, gone.map((g) => g.id))).run();
    for (const g of gone) audit(tx, { ...by(actor), studyId, entity: 'response', entityId: String(g.id), action: 'delete', oldValue: JSON.stringify(g) });
    for (const r of body.responses) if (r.id !== undefined) tx.update(responses).set({ symbol: `__${r.id}` }).where(eq(responses.id, r.id)).run();
    body.responses.forEach((r: ResponseInput, position) => {
      const { id, ...fields } = r;
      if (id === undefined) {
        const row = tx.insert(responses).values({ ...fields, studyId, position }).returning().get();
        audit(tx, { ...by(actor), studyId, entity: 'response', entityId: String(row.id), action: 'create', newValue: JSON.stringify(fields) });
      } else {
        tx.update(responses).set({ ...fields, position }).where(eq(responses.id, id)).run();
        const old = JSON.stringify(pick(byId.get(id)!, fields));
        if (old !== JSON.stringify(fields)) audit(tx, { ...by(actor), studyId, entity: 'response', entityId: String(id), action: 'update', oldValue: old, newValue: JSON.stringify(fields) });
      }
    });
    touchStudy(tx, studyId);
  });
  return loadSetup(db, studyId).responses;
}

export function putOutcomes(db: Db, actor: Actor, studyId: number, body: OutcomesBody): OutcomeRow[] {
  db.transaction((tx) => {
    const existing = loadSetup(tx, studyId).outcomes;
    const byId = checkIds(existing, body.outcomes, 'outcome', 'outcomes');
    const keep = new Set(body.outcomes.map((o) => o.id).filter((id): id is number => id !== undefined));
    const gone = existing.filter((e) => !keep.has(e.id));
    for (const g of gone) {
      const used = db.$client.prepare('select count(*) as n from runs where outcome_id = ?').get(g.id) as { n: number };
      if (used.n > 0) throw conflict(`Outcome "${g.label}" is recorded on ${used.n} runs and cannot be deleted; rename it or change those runs first`);
    }
    if (gone.length) tx.delete(outcomes).where(inArray(outcomes.id, gone.map((g) => g.id))).run();
    for (const g of gone) audit(tx, { ...by(actor), studyId, entity: 'outcome', entityId: String(g.id), action: 'delete', oldValue: JSON.stringify(g) });
    body.outcomes.forEach((o, position) => {
      const { id, ...fields } = o;
      if (id === undefined) {
        const row = tx.insert(outcomes).values({ ...fields, studyId, position }).returning().get();
        audit(tx, { ...by(actor), studyId, entity: 'outcome', entityId: String(row.id), action: 'create', newValue: JSON.stringify(fields) });
      } else {
        tx.update(outcomes).set({ ...fields, position }).where(eq(outcomes.id, id)).run();
        const old = JSON.stringify(pick(byId.get(id)!, fields));
        if (old !== JSON.stringify(fields)) audit(tx, { ...by(actor), studyId, entity: 'outcome', entityId: String(id), action: 'update', oldValue: old, newValue: JSON.stringify(fields) });
      }
    });
    touchStudy(tx, studyId);
  });
  return loadSetup(db, studyId).outcomes;
}

/** The stored row's values for the keys of `shape`, in the same key order, for an old/new comparison. */
function pick<T extends object>(row: T, shape: object): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(shape)) out[k] = (row as Record<string, unknown>)[k];
  return out;
}
