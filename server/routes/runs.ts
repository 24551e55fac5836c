import { Router } from 'express';
import { z } from 'zod';
import { runBatchBody, runPatchBody, runRemoveBody, runRestoreBody, runsQuery } from '../../shared/runs.js';
import type { AppContext } from '../context.js';
import { ALL_STUDY_ROLES, EDITOR_ROLES, studyMember } from '../auth/policy.js';
import { actorOf } from '../services/actor.js';
import { listAudit } from '../services/audit-query.js';
import { editRuns } from '../services/run-edits.js';
import { sendCachedJson } from '../middleware/send-cached.js';
import { cachedRunSheet } from '../services/run-sheet.js';
import { getRun, removeRun, restoreRun } from '../services/runs.js';

const runIdParam = z.coerce.number({ message: 'runId must be a number' }).int().positive();

/** The run sheet: read, per-cell edit, multi-cell batch, soft removal, per-run history. */
export function runsRouter(ctx: AppContext): Router {
  const r = Router();
  const db = () => ctx.db;
  const read = () => studyMember(db, { studyRoles: ALL_STUDY_ROLES });
  const edit = () => studyMember(db, { studyRoles: EDITOR_ROLES, scope: 'write' });

  r.get('/studies/:id/runs', read(), async (req, res) => {
    const q = runsQuery.parse(req.query);
    // Serialised once per data revision (10 000 runs are ~5 MB of JSON); see DEVELOPERS.md, caching.
    await sendCachedJson(req, res, cachedRunSheet(ctx.db, req.study!.id, q.includeRemoved === '1' || q.includeRemoved === 'true', q.layout ?? 'rows'));
  });

  r.post('/studies/:id/runs/batch', edit(), (req, res) => {
    const body = runBatchBody.parse(req.body);
    const out = editRuns(ctx.db, actorOf(req), req.study!.id, body.edits, { pathOf: (i) => `edits.${i}`, source: 'batch', reason: body.reason ?? null });
    res.json({ runs: out.runs, changes: out.changes, warnings: out.warnings, undo: { edits: out.undo } });
  });

  r.patch('/studies/:id/runs/:runId', edit(), (req, res) => {
    const runId = runIdParam.parse(req.params['runId']);
    const { reason, ...fields } = runPatchBody.parse(req.body);
    const out = editRuns(ctx.db, actorOf(req), req.study!.id, [{ ...fields, runId }], { pathOf: () => '', source: 'sheet', reason: reason ?? null });
    res.json({ run: out.runs[0] ?? getRun(ctx.db, req.study!.id, runId), changes: out.changes, warnings: out.warnings });
  });

  r.delete('/studies/:id/runs/:runId', edit(), (req, res) => {
    const runId = runIdParam.parse(req.params['runId']);
    const body = runRemoveBody.parse(req.body ?? {});
    res.json({ run: removeRun(ctx.db, actorOf(req), req.study!.id, runId, body.reason, body.version) });
  });

  r.post('/studies/:id/runs/:runId/restore', edit(), (req, res) => {
    const runId = runIdParam.parse(req.params['runId']);
    const body = runRestoreBody.parse(req.body);
    res.json({ run: restoreRun(ctx.db, actorOf(req), req.study!.id, runId, body.reason) });
  });

  r.get('/studies/:id/runs/:runId/history', read(), (req, res) => {
    const runId = runIdParam.parse(req.params['runId']);
    getRun(ctx.db, req.study!.id, runId);
    res.json(listAudit(ctx.db, req.study!.id, { runId, limit: 5000 }));
  });

  return r;
}
