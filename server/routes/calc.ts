import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { type Request, Router } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { angleComputeBody, anglePushBody, angleStoreBody, derivedHPreviewBody, derivedHStoreBody, hFromAngleBody, hill48Body, neckAngleBody } from '../../shared/calc.js';
import type { AppContext } from '../context.js';
import { ALL_STUDY_ROLES, EDITOR_ROLES, signedIn, studyMember } from '../auth/policy.js';
import { HttpError } from '../http-error.js';
import { actorOf } from '../services/actor.js';
import { attachmentDir } from '../services/attachments.js';
import { computeAngle, historyFileInfo, pushAngle, storeAngle, uploadHistory } from '../services/calc-angle.js';
import { calcOverview, previewDerivedH, storeDerivedH } from '../services/calc-derived.js';
import { hFromAngle, hill48, neckAngle } from '../services/calc-hill.js';

const idParam = (name: string) => z.coerce.number({ message: `${name} must be a number` }).int().positive();

/**
 * Response calculator (issue 7). The Hill 1948 relations are open to every signed-in user (pure
 * computation, nothing stored); the per-run angle and the derived H live under their study: members
 * read and compute, owners and contributors store. Bodies: shared/calc.ts; reference: GET /api/openapi.json.
 */
export function calcRouter(ctx: AppContext): Router {
  const r = Router();
  const db = () => ctx.db;
  const read = () => studyMember(db, { studyRoles: ALL_STUDY_ROLES });
  const edit = () => studyMember(db, { studyRoles: EDITOR_ROLES, scope: 'write' });
  const tmp = path.join(attachmentDir(ctx.config.dataDir), 'tmp');
  mkdirSync(tmp, { recursive: true });
  // To disk, like every attachment: the file is kept as the run's attachment after it parses.
  const upload = multer({ dest: tmp, limits: { fileSize: ctx.config.maxUploadBytes, files: 1, fields: 5 } });
  const runOf = (req: Request) => idParam('runId').parse(req.params['runId']);

  r.post('/calc/hill48', signedIn(), (req, res) => {
    res.json(hill48(hill48Body.parse(req.body)));
  });
  r.post('/calc/neck-angle', signedIn(), (req, res) => {
    res.json(neckAngle(neckAngleBody.parse(req.body)));
  });
  r.post('/calc/h-from-angle', signedIn(), (req, res) => {
    res.json(hFromAngle(hFromAngleBody.parse(req.body)));
  });

  r.get('/studies/:id/calc', read(), (req, res) => {
    const role = req.study!.role;
    res.json(calcOverview(ctx.db, req.study!.id, role === 'admin' || (EDITOR_ROLES as readonly string[]).includes(role)));
  });

  r.post('/studies/:id/runs/:runId/angle/files', edit(), upload.single('file'), async (req, res) => {
    if (!req.file) throw new HttpError(400, 'Attach the displacement history (CSV or XLSX) in the form field "file"', { details: [{ path: 'file', message: 'Required' }] });
    res.status(201).json({ file: await uploadHistory(ctx.db, ctx.config.dataDir, actorOf(req), req.study!.id, runOf(req), req.file) });
  });
  r.get('/studies/:id/runs/:runId/angle/files/:attachmentId', read(), async (req, res) => {
    const attachmentId = idParam('attachmentId').parse(req.params['attachmentId']);
    res.json({ file: await historyFileInfo(ctx.db, ctx.config.dataDir, req.study!.id, runOf(req), attachmentId) });
  });
  r.post('/studies/:id/runs/:runId/angle/compute', read(), async (req, res) => {
    res.json({ result: await computeAngle(ctx.db, ctx.config.dataDir, req.study!.id, runOf(req), angleComputeBody.parse(req.body)) });
  });
  r.post('/studies/:id/runs/:runId/angle/store', edit(), async (req, res) => {
    res.json(await storeAngle(ctx.db, ctx.config.dataDir, actorOf(req), req.study!.id, runOf(req), angleStoreBody.parse(req.body)));
  });
  r.post('/studies/:id/runs/:runId/angle/push', edit(), async (req, res) => {
    res.status(201).json(await pushAngle(ctx.db, ctx.config.dataDir, actorOf(req), req.study!.id, runOf(req), anglePushBody.parse(req.body)));
  });

  r.post('/studies/:id/calc/derived-h/preview', read(), (req, res) => {
    res.json({ result: previewDerivedH(ctx.db, req.study!.id, derivedHPreviewBody.parse(req.body)) });
  });
  r.post('/studies/:id/calc/derived-h', edit(), (req, res) => {
    res.json(storeDerivedH(ctx.db, actorOf(req), req.study!.id, derivedHStoreBody.parse(req.body)));
  });

  return r;
}
