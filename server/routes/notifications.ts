import { Router } from 'express';
import { z } from 'zod';
import { notificationsQuery } from '../../shared/analysis.js';
import type { AppContext } from '../context.js';
import { signedIn } from '../auth/policy.js';
import { listNotifications, markAllRead, markRead } from '../services/notifications.js';

const idParam = z.coerce.number({ message: 'id must be a number' }).int().positive();

/** The caller's own in-app notifications. */
export function notificationsRouter(ctx: AppContext): Router {
  const r = Router();

  r.get('/notifications', signedIn(), (req, res) => {
    const q = notificationsQuery.parse(req.query);
    res.json(listNotifications(ctx.db, req.user!.id, q.unread === '1' || q.unread === 'true'));
  });

  r.post('/notifications/read-all', signedIn({ scope: 'write' }), (req, res) => {
    res.json({ updated: markAllRead(ctx.db, req.user!.id) });
  });

  r.post('/notifications/:id/read', signedIn({ scope: 'write' }), (req, res) => {
    res.json({ notification: markRead(ctx.db, req.user!.id, idParam.parse(req.params['id'])) });
  });

  return r;
}
