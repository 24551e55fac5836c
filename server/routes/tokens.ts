import { Router } from 'express';
import { z } from 'zod';
import { tokenCreateBody } from '../../shared/tokens.js';
import type { AppContext } from '../context.js';
import { signedIn } from '../auth/policy.js';
import { createToken, listOwnTokens, revokeToken, sessionOnly } from '../services/tokens.js';

const idParam = z.coerce.number().int().positive();

/**
 * Personal access tokens: every user manages their own. Mounted first among the feature routers so
 * its token-use audit middleware sees every feature call made with a token.
 */
export function tokensRouter(ctx: AppContext): Router {
  const r = Router();

  r.get('/tokens', signedIn(), sessionOnly, (req, res) => {
    res.json({ tokens: listOwnTokens(ctx, req.user!.id) });
  });

  r.post('/tokens', signedIn({ scope: 'write' }), sessionOnly, (req, res) => {
    const body = tokenCreateBody.parse(req.body);
    res.status(201).json(createToken(ctx, req.user!.id, body));
  });

  r.delete('/tokens/:id', signedIn({ scope: 'write' }), sessionOnly, (req, res) => {
    const id = idParam.parse(req.params['id']);
    res.json({ token: revokeToken(ctx, req.user!.id, id) });
  });

  return r;
}
