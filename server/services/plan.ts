import { desc, eq } from 'drizzle-orm';
import type { PlanBody } from '../../shared/runs.js';
import type { Db } from '../db/client.js';
import { plans, runs, users } from '../db/schema.js';
import { conflict } from '../http-error.js';
import { audit, type DbOrTx } from './audit.js';
import { by, type Actor } from './actor.js';
import { generatePlan, type GeneratedPlan } from './plan-engine.js';
import { loadSetup } from './study-setup.js';
import { autoAdvance, getStudyRow, runsWithResults, touchStudy } from './studies.js';

/**
 * Plans: the engine (server/stats/designs, through plan-engine.ts) turns the request into runs; this
 * file keeps them. Committing replaces the study's runs, which is only allowed while no run holds a
 * result — otherwise recorded specimens would silently lose the settings they were made to.
 */

export function currentPlan(db: DbOrTx, studyId: number) {
  const row = db
    .select({ id: plans.id, spec: plans.spec, summary: plans.summary, createdAt: plans.createdAt, createdBy: plans.createdBy, createdByName: users.name })
    .from(plans)
    .innerJoin(users, eq(users.id, plans.createdBy))
    .where(eq(plans.studyId, studyId))
    .orderBy(desc(plans.id))
    .limit(1)
    .get();
  return row ?? null;
}

export function previewPlan(db: Db, studyId: number, body: PlanBody) {
  const generated = generatePlan(loadSetup(db, studyId), body);
  return { ...generated.summary, runs: generated.runs };
}

const codeOf = (runOrder: number, total: number) => 'R' + String(runOrder).padStart(Math.max(3, String(total).length), '0');

export function commitPlan(db: Db, actor: Actor, studyId: number, body: PlanBody) {
  const generated: GeneratedPlan = generatePlan(loadSetup(db, studyId), body);
  return db.transaction((tx) => {
    const withResults = runsWithResults(db, studyId);
    if (withResults > 0) {
      throw conflict(
        `The plan cannot be regenerated: ${withResults} runs already hold results (values, outcomes, notes or files). ` +
          'Regenerating would detach those results from the settings they were made to. Remove the results first, or start a new study for a new design.',
      );
    }
    const study = getStudyRow(tx, studyId);
    const old = tx.select({ id: runs.id }).from(runs).where(eq(runs.studyId, studyId)).all();
    const previous = currentPlan(tx, studyId);
    if (old.length) tx.delete(runs).where(eq(runs.studyId, studyId)).run();
    const plan = tx.insert(plans).values({ studyId, spec: body, summary: generated.summary, createdBy: actor.userId }).returning().get();
    const total = generated.runs.length;
    // One prepared statement run per row inside the transaction: far cheaper than building large
    // multi-row INSERTs through the query builder for plans of 10^4-10^5 runs.
    const insert = db.$client.prepare(
      'insert into runs (study_id, plan_id, code, standard_order, run_order, block, centre_point, settings) values (?, ?, ?, ?, ?, ?, ?, ?)',
    );
    for (const r of generated.runs) {
      insert.run(studyId, plan.id, codeOf(r.runOrder, total), r.standardOrder, r.runOrder, r.block, r.centrePoint ? 1 : 0, JSON.stringify(r.settings));
    }
    audit(tx, {
      ...by(actor),
      studyId,
      entity: 'plan',
      entityId: String(plan.id),
      action: previous ? 'replace' : 'create',
      oldValue: previous ? JSON.stringify({ planId: previous.id, runs: old.length }) : null,
      newValue: JSON.stringify({ ...body, runs: total }),
    });
    touchStudy(tx, studyId);
    if (study.status === 'draft') autoAdvance(tx, actor, studyId, 'draft', 'planned', 'plan committed');
    return { plan: currentPlan(tx, studyId), runCount: total };
  });
}
