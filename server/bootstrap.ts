import { readFileSync } from 'node:fs';
import path from 'node:path';
import pino, { type Logger } from 'pino';
import type { Config } from './config.js';
import type { AppContext } from './context.js';
import { openDatabase } from './db/client.js';
import { DrizzleSessionStore } from './auth/session-store.js';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp.js';
import { createMailer } from './mail/mailer.js';
import { seedDemo } from './services/seed.js';

export const VERSION: string = (
  JSON.parse(readFileSync(path.resolve(import.meta.dirname, '../package.json'), 'utf8')) as { version: string }
).version;

export interface Running {
  ctx: AppContext;
  fakeSmtp: FakeSmtp | null;
  close(): Promise<void>;
}

/** Opens the database (migrating it), starts mail (the local fake unless SMTP is configured), seeds the demo. */
export async function createContext(config: Config, log: Logger = pino({ level: config.logLevel })): Promise<Running> {
  const db = openDatabase(path.join(config.dataDir, 'specimetry.db'));
  const fakeSmtp = config.smtp ? null : await startFakeSmtp(db, config.fakeSmtpPort);
  const mailer = createMailer(
    config.smtp ? { ...config.smtp, fake: false } : { host: '127.0.0.1', port: fakeSmtp!.port, secure: false, fake: true },
    config.mailFrom,
    log,
  );
  const ctx: AppContext = {
    config,
    db,
    log,
    mailer,
    sessionStore: new DrizzleSessionStore(db),
    version: VERSION,
    publicUrl: (origin) => config.publicUrl ?? origin ?? `http://localhost:${config.port}`,
  };
  if (config.demo) await seedDemo(ctx);
  const pruner = setInterval(() => ctx.sessionStore.prune(), 60 * 60 * 1000);
  pruner.unref();
  return {
    ctx,
    fakeSmtp,
    async close() {
      clearInterval(pruner);
      mailer.close();
      await fakeSmtp?.close();
      db.$client.close();
    },
  };
}
