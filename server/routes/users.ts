import { Router } from 'express';
import { z } from 'zod';
import { acceptInvitationBody, invitationBody, userPatchBody } from '../../shared/auth.js';
import type { AppContext } from '../context.js';
import { renewCsrfToken } from '../auth/csrf.js';
import { publicRoute, signedIn } from '../auth/policy.js';
import { acceptInvitation, invite, listInvitations, lookupInvitation } from '../services/invitations.js';
import { listUsers, patchUser, toPublicUser } from '../services/users.js';
import { requestOrigin } from './auth.js';

const idParam = z.coerce.number().int().positive();
const adminOnly = () => signedIn({ roles: ['admin'] });

export function usersRouter(ctx: AppContext): Router {
  const r = Router();

  r.get('/users', adminOnly(), (_req, res) => {
    res.json({ users: listUsers(ctx) });
  });

  r.patch('/users/:id', signedIn({ roles: ['admin'], scope: 'write' }), (req, res) => {
    const id = idParam.parse(req.params['id']);
    const patch = userPatchBody.parse(req.body);
    res.json({ user: patchUser(ctx, req.user!.id, id, patch) });
  });

  r.get('/invitations', adminOnly(), (_req, res) => {
    res.json({ invitations: listInvitations(ctx) });
  });

  r.post('/invitations', signedIn({ roles: ['admin'], scope: 'write' }), async (req, res) => {
    const body = invitationBody.parse(req.body);
    res.status(201).json({ invitation: await invite(ctx, req.user!.id, body, requestOrigin(req)) });
  });

  r.get('/invitations/lookup', publicRoute(), (req, res) => {
    const token = z.string().min(20).max(200).parse(req.query['token']);
    res.json(lookupInvitation(ctx, token));
  });

  r.post('/invitations/accept', publicRoute(), async (req, res, next) => {
    const body = acceptInvitationBody.parse(req.body);
    const user = toPublicUser(await acceptInvitation(ctx, body.token, body.name, body.password));
    req.session.regenerate((err) => {
      if (err) return next(err);
      req.login(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        renewCsrfToken(req, res);
        res.status(201).json({ user });
      });
    });
  });

  return r;
}
