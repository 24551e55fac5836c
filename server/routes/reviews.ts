import { Router } from 'express';
import { z } from 'zod';
import { anchorSchema, approveBody, commentBody, recommendationBody, resolveBody, returnBody, reviewRequestBody } from '../../shared/analysis.js';
import type { AppContext } from '../context.js';
import { ALL_STUDY_ROLES, EDITOR_ROLES, studyMember } from '../auth/policy.js';
import { actorOf } from '../services/actor.js';
import { getAnalysisRow } from '../services/analysis.js';
import { currentRecommendation, putRecommendation } from '../services/recommendation.js';
import { addComment, listThreads, resolveThread } from '../services/review-comments.js';
import { approveAnalysis, listReviewRequests, requestReview, requireSignOffRole, returnAnalysis } from '../services/review.js';
import { requestOrigin } from './auth.js';
import { analysisOf, analysisStudy, detailFor } from './analyses.js';

const commentIdParam = z.coerce.number({ message: 'commentId must be a number' }).int().positive();
const commentsQuery = z.object({ anchor: anchorSchema.optional() });

/** Review requests, comments, sign-off (approve / return) and the study's recommendation. */
export function reviewsRouter(ctx: AppContext): Router {
  const r = Router();
  const db = () => ctx.db;
  const on = (studyRoles: readonly ('owner' | 'contributor' | 'reviewer' | 'viewer')[], scope: 'read' | 'write' = 'write', roles?: readonly ('supervisor')[]) =>
    studyMember(db, { studyRoles, scope, roles, studyOf: analysisStudy });
  const discussants = ['owner', 'contributor', 'reviewer'] as const;

  r.post('/analyses/:id/review-requests', on(['owner']), async (req, res) => {
    const body = reviewRequestBody.parse(req.body);
    const out = await requestReview(ctx, actorOf(req), analysisOf(ctx.db, req), body, requestOrigin(req));
    res.status(201).json(out);
  });

  r.get('/analyses/:id/review-requests', on(ALL_STUDY_ROLES, 'read'), (req, res) => {
    res.json({ reviewRequests: listReviewRequests(ctx.db, analysisOf(ctx.db, req).id) });
  });

  r.post('/analyses/:id/comments', on(discussants), (req, res) => {
    const body = commentBody.parse(req.body);
    res.status(201).json({ comment: addComment(ctx.db, actorOf(req), analysisOf(ctx.db, req), body) });
  });

  r.get('/analyses/:id/comments', on(ALL_STUDY_ROLES, 'read'), (req, res) => {
    const q = commentsQuery.parse(req.query);
    res.json({ threads: listThreads(ctx.db, analysisOf(ctx.db, req).id, q.anchor) });
  });

  r.post('/analyses/:id/comments/:commentId/resolve', on(discussants), (req, res) => {
    const commentId = commentIdParam.parse(req.params['commentId']);
    const body = resolveBody.parse(req.body ?? {});
    res.json({ thread: resolveThread(ctx.db, actorOf(req), analysisOf(ctx.db, req), commentId, body.resolved) });
  });

  // The supervisor requirement is also checked in the service, which refuses admins as well:
  // signing off is a qualified person's act, not an administrative one.
  r.post('/analyses/:id/approve', on(['reviewer'], 'write', ['supervisor']), (req, res) => {
    requireSignOffRole(actorOf(req), req.study!.role, 'signs off');
    const body = approveBody.parse(req.body ?? {});
    const row = analysisOf(ctx.db, req);
    approveAnalysis(ctx.db, actorOf(req), req.study!.role, row, body.note);
    res.json({ analysis: detailFor(ctx.db, req, getAnalysisRow(ctx.db, row.id)) });
  });

  r.post('/analyses/:id/return', on(['reviewer'], 'write', ['supervisor']), (req, res) => {
    requireSignOffRole(actorOf(req), req.study!.role, 'returns');
    const body = returnBody.parse(req.body);
    const row = analysisOf(ctx.db, req);
    returnAnalysis(ctx.db, actorOf(req), req.study!.role, row, body.reason);
    res.json({ analysis: detailFor(ctx.db, req, getAnalysisRow(ctx.db, row.id)) });
  });

  r.put('/studies/:id/recommendation', studyMember(db, { studyRoles: EDITOR_ROLES, scope: 'write' }), (req, res) => {
    const body = recommendationBody.parse(req.body);
    res.json({ recommendation: putRecommendation(ctx.db, actorOf(req), req.study!.id, body) });
  });

  r.get('/studies/:id/recommendation', studyMember(db, { studyRoles: ALL_STUDY_ROLES }), (req, res) => {
    res.json({ recommendation: currentRecommendation(ctx.db, req.study!.id) });
  });

  return r;
}
