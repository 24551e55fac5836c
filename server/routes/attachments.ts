import { Router } from 'express';
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import multer from 'multer';
import { z } from 'zod';
import { attachmentDeleteBody } from '../../shared/runs.js';
import type { AppContext } from '../context.js';
import { ALL_STUDY_ROLES, EDITOR_ROLES, studyMember } from '../auth/policy.js';
import { HttpError } from '../http-error.js';
import { actorOf } from '../services/actor.js';
import { addAttachment, attachmentDir, attachmentFile, checkAttachmentName, deleteAttachment, listAttachments } from '../services/attachments.js';

const idParam = (name: string) => z.coerce.number({ message: `${name} must be a number` }).int().positive();

export function attachmentsRouter(ctx: AppContext): Router {
  const r = Router();
  const db = () => ctx.db;
  const read = () => studyMember(db, { studyRoles: ALL_STUDY_ROLES });
  const edit = () => studyMember(db, { studyRoles: EDITOR_ROLES, scope: 'write' });
  const tmp = path.join(attachmentDir(ctx.config.dataDir), 'tmp');
  mkdirSync(tmp, { recursive: true });
  // To disk, not memory: FE result files reach the upload limit and several may arrive at once.
  const upload = multer({
    dest: tmp,
    limits: { fileSize: ctx.config.maxUploadBytes, files: 1, fields: 5 },
    fileFilter: (_req, file, cb) => {
      try {
        checkAttachmentName(file.originalname);
        cb(null, true);
      } catch (err) {
        // Expected for a refused type: multer passes the HttpError (400, names the type) to the error handler.
        cb(err as Error);
      }
    },
  });

  r.post('/studies/:id/runs/:runId/attachments', edit(), upload.single('file'), async (req, res) => {
    const runId = idParam('runId').parse(req.params['runId']);
    if (!req.file) throw new HttpError(400, 'Attach the file in the form field "file"', { details: [{ path: 'file', message: 'Required' }] });
    const kind = String((req.body as Record<string, unknown> | undefined)?.['kind'] ?? 'raw');
    const attachment = await addAttachment(ctx.db, ctx.config.dataDir, actorOf(req), req.study!.id, runId, req.file, kind);
    res.status(201).json({ attachment });
  });

  r.get('/studies/:id/runs/:runId/attachments', read(), (req, res) => {
    res.json({ attachments: listAttachments(ctx.db, req.study!.id, idParam('runId').parse(req.params['runId'])) });
  });

  r.get('/studies/:id/attachments/:attachmentId/download', read(), (req, res, next) => {
    const { file, row } = attachmentFile(ctx.db, ctx.config.dataDir, req.study!.id, idParam('attachmentId').parse(req.params['attachmentId']));
    res.setHeader('X-Checksum-SHA256', row.sha256);
    res.download(file, row.fileName, { headers: { 'Content-Type': row.mimeType } }, (err) => {
      if (err && !res.headersSent) next(err);
    });
  });

  r.delete('/studies/:id/attachments/:attachmentId', edit(), (req, res) => {
    const body = attachmentDeleteBody.parse(req.body ?? {});
    res.json({ attachment: deleteAttachment(ctx.db, ctx.config.dataDir, actorOf(req), req.study!.id, idParam('attachmentId').parse(req.params['attachmentId']), body.reason) });
  });

  return r;
}
