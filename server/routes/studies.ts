import { Router } from 'express';
import { planBody } from '../../shared/runs.js';
import { factorsBody, memberBody, memberDeleteQuery, outcomesBody, responsesBody, studyCreateBody, studyListQuery, studyPatchBody } from '../../shared/studies.js';
import type { AppContext } from '../context.js';
import { ALL_STUDY_ROLES, EDITOR_ROLES, signedIn, studyMember } from '../auth/policy.js';
import { actorOf } from '../services/actor.js';
import { commitPlan, currentPlan, previewPlan } from '../services/plan.js';
import { listMembers, memberCandidates, removeMember, upsertMember } from '../services/study-members.js';
import { loadSetup, putFactors, putOutcomes, putResponses } from '../services/study-setup.js';
import { createStudy, getStudyDetail, listStudies, patchStudy } from '../services/studies.js';

/** Studies, membership, set-up (factors, responses, outcomes) and the plan. Contract: docs/api-studies.md. */
export function studiesRouter(ctx: AppContext): Router {
  const r = Router();
  const db = () => ctx.db;
  const read = () => studyMember(db, { studyRoles: ALL_STUDY_ROLES });
  const edit = () => studyMember(db, { studyRoles: EDITOR_ROLES, scope: 'write' });
  const owner = () => studyMember(db, { studyRoles: ['owner'], scope: 'write' });
  const sid = (req: Express.Request) => req.study!.id;

  r.get('/studies', signedIn(), (req, res) => {
    const q = studyListQuery.parse(req.query);
    res.json({ studies: listStudies(ctx.db, { id: req.user!.id, isAdmin: req.user!.role === 'admin' }, q) });
  });

  r.post('/studies', signedIn({ roles: ['engineer', 'admin'], scope: 'write' }), (req, res) => {
    const body = studyCreateBody.parse(req.body);
    const id = createStudy(ctx.db, actorOf(req), body);
    res.status(201).json({ study: getStudyDetail(ctx.db, id, req.user!.role === 'admin' ? 'admin' : 'owner') });
  });

  r.get('/studies/:id', read(), (req, res) => {
    res.json({ study: getStudyDetail(ctx.db, sid(req), req.study!.role) });
  });

  r.patch('/studies/:id', edit(), (req, res) => {
    const body = studyPatchBody.parse(req.body);
    patchStudy(ctx.db, actorOf(req), req.study!.role, sid(req), body);
    res.json({ study: getStudyDetail(ctx.db, sid(req), req.study!.role) });
  });

  r.get('/studies/:id/members', read(), (req, res) => {
    res.json({ members: listMembers(ctx.db, sid(req)) });
  });

  r.get('/studies/:id/member-candidates', edit(), (req, res) => {
    res.json({ users: memberCandidates(ctx.db, sid(req)) });
  });

  r.post('/studies/:id/members', owner(), (req, res) => {
    upsertMember(ctx.db, actorOf(req), sid(req), memberBody.parse(req.body));
    res.status(201).json({ members: listMembers(ctx.db, sid(req)) });
  });

  r.delete('/studies/:id/members', owner(), (req, res) => {
    const { userId } = memberDeleteQuery.parse({ userId: req.query['userId'] ?? (req.body as { userId?: unknown } | undefined)?.userId });
    removeMember(ctx.db, actorOf(req), sid(req), userId);
    res.json({ members: listMembers(ctx.db, sid(req)) });
  });

  r.put('/studies/:id/factors', edit(), (req, res) => {
    res.json({ factors: putFactors(ctx.db, actorOf(req), sid(req), factorsBody.parse(req.body)) });
  });

  r.put('/studies/:id/responses', edit(), (req, res) => {
    res.json({ responses: putResponses(ctx.db, actorOf(req), sid(req), responsesBody.parse(req.body)) });
  });

  r.get('/studies/:id/outcomes', read(), (req, res) => {
    res.json({ outcomes: loadSetup(ctx.db, sid(req)).outcomes });
  });

  r.put('/studies/:id/outcomes', edit(), (req, res) => {
    res.json({ outcomes: putOutcomes(ctx.db, actorOf(req), sid(req), outcomesBody.parse(req.body)) });
  });

  r.get('/studies/:id/plan', read(), (req, res) => {
    res.json({ plan: currentPlan(ctx.db, sid(req)) });
  });

  r.post('/studies/:id/plan/preview', edit(), (req, res) => {
    res.json({ preview: previewPlan(ctx.db, sid(req), planBody.parse(req.body)) });
  });

  r.post('/studies/:id/plan', edit(), (req, res) => {
    res.status(201).json(commitPlan(ctx.db, actorOf(req), sid(req), planBody.parse(req.body)));
  });

  return r;
}
