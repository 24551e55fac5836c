import { Router } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { importMapping } from '../../shared/runs.js';
import type { AppContext } from '../context.js';
import { ALL_STUDY_ROLES, EDITOR_ROLES, studyMember } from '../auth/policy.js';
import { HttpError } from '../http-error.js';
import { actorOf } from '../services/actor.js';
import { parseImportFile } from '../services/import-parse.js';
import { withOperation } from '../ops/progress.js';
import { commitImport, createImport, discardImport, getImport, remapImport } from '../services/imports.js';

const importIdParam = z.coerce.number({ message: 'importId must be a number' }).int().positive();

function parseMappingField(raw: unknown) {
  if (raw === undefined || raw === '') return undefined;
  let json: unknown;
  try {
    json = JSON.parse(String(raw));
  } catch {
    // Expected when the form field is not JSON: say so instead of a generic 500.
    throw new HttpError(400, 'The "mapping" field must be JSON like {"columns": {"Run": "run", "H": "response:H"}}', { details: [{ path: 'mapping', message: 'Not JSON' }] });
  }
  return importMapping.parse(json);
}

/** CSV/XLSX import: upload -> preview with row errors -> (re-map) -> commit all-or-nothing. */
export function importsRouter(ctx: AppContext): Router {
  const r = Router();
  const db = () => ctx.db;
  const read = () => studyMember(db, { studyRoles: ALL_STUDY_ROLES });
  const edit = () => studyMember(db, { studyRoles: EDITOR_ROLES, scope: 'write' });
  // In memory: the file is parsed at once and only the parsed table is kept with the import.
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: ctx.config.maxUploadBytes, files: 1, fields: 5 } });

  r.post('/studies/:id/imports', edit(), upload.single('file'), async (req, res) => {
    if (!req.file) throw new HttpError(400, 'Attach the CSV or XLSX file in the form field "file"', { details: [{ path: 'file', message: 'Required' }] });
    const mapping = parseMappingField((req.body as Record<string, unknown> | undefined)?.['mapping']);
    const file = req.file;
    // Progress for the client's bar: the upload itself is tracked by the browser; here the phases
    // parse -> validate are reported (each phase is one synchronous step, so it moves per phase).
    const preview = await withOperation(ctx, req, 'import', async (op) => {
      op.update('parsing', 0, 2);
      const table = await parseImportFile(file.originalname, file.mimetype, file.buffer);
      await op.checkpoint('validating', 1, 2);
      return createImport(ctx.db, actorOf(req), req.study!.id, { name: file.originalname, buffer: file.buffer }, table, mapping);
    });
    res.status(201).json({ import: preview });
  });

  r.get('/studies/:id/imports/:importId', read(), (req, res) => {
    res.json({ import: getImport(ctx.db, req.study!.id, importIdParam.parse(req.params['importId'])) });
  });

  r.put('/studies/:id/imports/:importId/mapping', edit(), (req, res) => {
    const mapping = importMapping.parse(req.body);
    res.json({ import: remapImport(ctx.db, req.study!.id, importIdParam.parse(req.params['importId']), mapping) });
  });

  r.post('/studies/:id/imports/:importId/commit', edit(), async (req, res) => {
    const id = importIdParam.parse(req.params['importId']);
    const result = await withOperation(ctx, req, 'import-commit', async (op) => {
      op.update('writing', 0, 1);
      return commitImport(ctx.db, actorOf(req), req.study!.id, id);
    });
    res.json(result);
  });

  r.delete('/studies/:id/imports/:importId', edit(), (req, res) => {
    res.json({ import: discardImport(ctx.db, actorOf(req), req.study!.id, importIdParam.parse(req.params['importId'])) });
  });

  return r;
}
