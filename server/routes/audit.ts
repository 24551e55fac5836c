import { Router } from 'express';
import { auditQuery } from '../../shared/runs.js';
import type { AppContext } from '../context.js';
import { ALL_STUDY_ROLES, studyMember } from '../auth/policy.js';
import { auditCsv, listAudit } from '../services/audit-query.js';

/** The per-study audit trail with filters; `format=csv` downloads the filtered rows. */
export function auditRouter(ctx: AppContext): Router {
  const r = Router();

  r.get('/studies/:id/audit', studyMember(() => ctx.db, { studyRoles: ALL_STUDY_ROLES }), (req, res) => {
    const q = auditQuery.parse(req.query);
    const out = listAudit(ctx.db, req.study!.id, q.format === 'csv' ? { ...q, limit: q.limit === 200 ? 100_000 : q.limit } : q);
    if (q.format === 'csv') res.attachment(`study-${req.study!.id}-audit.csv`).type('text/csv; charset=utf-8').send(auditCsv(out.events));
    else res.json(out);
  });

  return r;
}
