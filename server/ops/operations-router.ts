import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import { signedIn } from '../auth/policy.js';
import { progressRegistry } from './progress.js';

const operationId = z.string().regex(/^[A-Za-z0-9_-]{8,64}$/, 'An operation id is 8–64 letters, digits, _ or -');

/** GET /api/operations/:id — progress of a long operation started by the caller. */
export function operationsRouter(ctx: AppContext): Router {
  const r = Router();
  r.get('/operations/:id', signedIn(), (req, res) => {
    const id = operationId.parse(req.params['id']);
    res.setHeader('Cache-Control', 'no-store');
    res.json({ operation: progressRegistry(ctx).get(id, req.user!) });
  });
  return r;
}
