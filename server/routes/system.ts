import { desc, eq } from 'drizzle-orm';
import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import { migrationLevel } from '../db/client.js';
import { mailMessages } from '../db/schema.js';
import { HttpError, notFound } from '../http-error.js';
import { publicRoute, signedIn } from '../auth/policy.js';

export function systemRouter(ctx: AppContext): Router {
  const r = Router();

  r.get('/health', publicRoute(), (_req, res) => {
    let db = 'ok';
    let migrations: ReturnType<typeof migrationLevel> | null = null;
    try {
      ctx.db.$client.prepare('select 1').get();
      migrations = migrationLevel(ctx.db);
    } catch {
      // The health check reports a broken database rather than crashing on it.
      db = 'error';
    }
    res.status(db === 'ok' ? 200 : 503).json({ status: db === 'ok' ? 'ok' : 'degraded', db, version: ctx.version, migrations });
  });

  r.get('/config', publicRoute(), (_req, res) => {
    res.json({ version: ctx.version, mailFake: ctx.mailer.fake, demo: ctx.config.demo });
  });

  const outboxGuard = () => {
    if (!ctx.mailer.fake) throw new HttpError(404, 'The mail outbox exists only while the built-in test mail server is in use');
  };

  r.get('/mail/outbox', signedIn({ roles: ['admin'] }), (_req, res) => {
    outboxGuard();
    const messages = ctx.db
      .select({ id: mailMessages.id, sender: mailMessages.sender, recipients: mailMessages.recipients, subject: mailMessages.subject, receivedAt: mailMessages.receivedAt })
      .from(mailMessages)
      .orderBy(desc(mailMessages.id))
      .limit(500)
      .all();
    res.json({ messages });
  });

  r.get('/mail/outbox/:id', signedIn({ roles: ['admin'] }), (req, res) => {
    outboxGuard();
    const id = z.coerce.number().int().positive().parse(req.params['id']);
    const message = ctx.db.select().from(mailMessages).where(eq(mailMessages.id, id)).get();
    if (!message) throw notFound('The message');
    res.json({ message });
  });

  return r;
}
