import { Router, type Request } from 'express';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { analysisSpec, saveAnalysisBody } from '../../shared/analysis.js';
import type { AppContext } from '../context.js';
import type { Db } from '../db/client.js';
import { analyses } from '../db/schema.js';
import { ALL_STUDY_ROLES, studyMember, type StudyLocator } from '../auth/policy.js';
import { actorOf } from '../services/actor.js';
import {
  analysisDetail,
  completeSpec,
  freshness,
  getAnalysisRow,
  listAnalyses,
  saveAnalysis,
  studyOfAnalysis,
  type AnalysisRow,
} from '../services/analysis.js';
import { approvalRefusal, listReviewRequests } from '../services/review.js';
import { sendCachedJson } from '../middleware/send-cached.js';
import { cachedPreview } from '../services/preview-cache.js';
import { reportHtml, reportPdf } from '../services/report.js';

const idParam = z.coerce.number({ message: 'id must be a number' }).int().positive();

/** /api/analyses/:id routes are authorised against the analysis's study. */
export const analysisStudy: StudyLocator = (req, db) => {
  const id = Number(req.params['id']);
  if (!Number.isInteger(id) || id <= 0) return undefined;
  return db.select({ studyId: analyses.studyId }).from(analyses).where(eq(analyses.id, id)).get()?.studyId;
};

export const SAVE_ROLES = ['owner', 'contributor', 'reviewer'] as const;

/** The analysis row named by :id, already known to belong to req.study. */
export function analysisOf(db: Db, req: Request): AnalysisRow {
  return getAnalysisRow(db, idParam.parse(req.params['id']));
}

/** The full view for this caller: stored result, today's freshness, and what they may do. */
export function detailFor(db: Db, req: Request, row: AnalysisRow) {
  const fresh = freshness(db, row);
  const study = studyOfAnalysis(db, row.id);
  const role = req.study!.role;
  const actor = actorOf(req);
  const refusal = approvalRefusal(actor, role, row, study.ownerId, fresh);
  return analysisDetail(db, row, fresh, {
    reviewRequests: listReviewRequests(db, row.id),
    can: {
      requestReview: (role === 'owner' || role === 'admin') && row.status !== 'approved' && !fresh.stale,
      comment: role !== 'viewer',
      approve: refusal === null,
      approveRefusal: refusal?.message ?? null,
    },
  });
}

/** Preview, save, list and view analyses; the report of one. */
export function analysesRouter(ctx: AppContext): Router {
  const r = Router();
  const db = () => ctx.db;
  const read = () => studyMember(db, { studyRoles: ALL_STUDY_ROLES });
  const readAnalysis = () => studyMember(db, { studyRoles: ALL_STUDY_ROLES, studyOf: analysisStudy });

  // A preview writes nothing, so read-only tokens may run it.
  r.post('/studies/:id/analyses/preview', read(), async (req, res) => {
    const spec = completeSpec(analysisSpec.parse(req.body));
    // Cached per study data revision and spec (DEVELOPERS.md, caching).
    await sendCachedJson(req, res, cachedPreview(ctx.db, req.study!.id, spec));
  });

  r.post('/studies/:id/analyses', studyMember(db, { studyRoles: SAVE_ROLES, scope: 'write' }), (req, res) => {
    const { title, ...spec } = saveAnalysisBody.parse(req.body);
    const id = saveAnalysis(ctx.db, actorOf(req), req.study!.id, completeSpec(spec), title);
    res.status(201).json({ analysis: detailFor(ctx.db, req, getAnalysisRow(ctx.db, id)) });
  });

  r.get('/studies/:id/analyses', read(), (req, res) => {
    res.json({ analyses: listAnalyses(ctx.db, req.study!.id) });
  });

  r.get('/analyses/:id', readAnalysis(), (req, res) => {
    res.json({ analysis: detailFor(ctx.db, req, analysisOf(ctx.db, req)) });
  });

  r.get('/analyses/:id/report.pdf', readAnalysis(), async (req, res) => {
    const row = analysisOf(ctx.db, req);
    const pdf = await reportPdf(ctx.db, row);
    res.setHeader('Content-Disposition', `attachment; filename="analysis-${row.id}-report.pdf"`);
    res.type('application/pdf').send(pdf);
  });

  r.get('/analyses/:id/report.html', readAnalysis(), (req, res) => {
    const row = analysisOf(ctx.db, req);
    res.type('text/html').send(reportHtml(ctx.db, row));
  });

  return r;
}
