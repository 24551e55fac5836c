import { Router } from 'express';
import { idempotencyKey, parseResultPush } from '../../shared/results.js';
import type { AppContext } from '../context.js';
import { HttpError } from '../http-error.js';
import { EDITOR_ROLES, studyMember } from '../auth/policy.js';
import { actorOf } from '../services/actor.js';
import { pushResults } from '../services/results.js';

/** Scripted bulk result push (see services/results.ts for the idempotency and concurrency rules). */
export function resultsRouter(ctx: AppContext): Router {
  const r = Router();

  r.post('/studies/:id/results', studyMember(() => ctx.db, { studyRoles: EDITOR_ROLES, scope: 'write' }), (req, res) => {
    const body = parseResultPush(req.body);
    const header = req.get('idempotency-key');
    const inBody = Array.isArray(body) ? undefined : body.idempotencyKey;
    if (header !== undefined && inBody !== undefined && header !== inBody) {
      throw new HttpError(400, `The Idempotency-Key header ("${header}") and the body's idempotencyKey ("${inBody}") differ; send one`);
    }
    const raw = header ?? inBody;
    if (raw === undefined) throw new HttpError(400, 'Send an Idempotency-Key header (or idempotencyKey in the body) so a retried push is applied once');
    const key = idempotencyKey.parse(raw);
    const items = Array.isArray(body) ? body : body.results;
    const reason = Array.isArray(body) ? undefined : body.reason;
    const { replayed, response } = pushResults(ctx.db, actorOf(req), req.study!.id, key, items, reason);
    if (replayed) res.setHeader('Idempotent-Replayed', 'true');
    res.status(200).json(response);
  });

  return r;
}
