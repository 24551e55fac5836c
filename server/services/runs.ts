import { and, eq } from 'drizzle-orm';
import type { Db } from '../db/client.js';
import { runs } from '../db/schema.js';
import { conflict, notFound } from '../http-error.js';
import { audit } from './audit.js';
import { by, type Actor } from './actor.js';
import { loadRuns, type Run } from './run-sheet.js';
import { touchStudyTime } from './studies.js';

/**
 * Removing a run is soft: the row stays with removedAt and the reason, is left out of the sheet
 * (unless asked for) and of the analysis, and can be restored. Nothing is deleted silently.
 */

function runOf(db: Db, studyId: number, runId: number): Run {
  const run = loadRuns(db, studyId, { ids: [runId] })[0];
  if (!run) throw notFound(`Run ${runId} of this study`);
  return run;
}

export function getRun(db: Db, studyId: number, runId: number): Run {
  return runOf(db, studyId, runId);
}

export function removeRun(db: Db, actor: Actor, studyId: number, runId: number, reason: string, version?: number): Run {
  db.transaction((tx) => {
    const run = runOf(db, studyId, runId);
    if (run.removedAt !== null) throw conflict(`Run ${run.code} is already removed (${run.removedReason})`, run);
    if (version !== undefined && version !== run.version) throw conflict(`Run ${run.code} was changed by someone else (now version ${run.version}, you sent ${version})`, run);
    tx.update(runs)
      .set({ removedAt: Date.now(), removedReason: reason, version: run.version + 1, updatedAt: Date.now() })
      .where(and(eq(runs.id, runId), eq(runs.studyId, studyId)))
      .run();
    audit(tx, { ...by(actor), studyId, runId, entity: 'run', entityId: String(runId), action: 'remove', field: 'removed', oldValue: null, newValue: 'removed', reason });
    touchStudyTime(tx, studyId);
  });
  return runOf(db, studyId, runId);
}

export function restoreRun(db: Db, actor: Actor, studyId: number, runId: number, reason: string): Run {
  db.transaction((tx) => {
    const run = runOf(db, studyId, runId);
    if (run.removedAt === null) throw conflict(`Run ${run.code} is not removed`, run);
    tx.update(runs).set({ removedAt: null, removedReason: null, version: run.version + 1, updatedAt: Date.now() }).where(eq(runs.id, runId)).run();
    audit(tx, { ...by(actor), studyId, runId, entity: 'run', entityId: String(runId), action: 'restore', field: 'removed', oldValue: run.removedReason, newValue: null, reason });
    touchStudyTime(tx, studyId);
  });
  return runOf(db, studyId, runId);
}
