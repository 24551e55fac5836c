import type { Logger } from 'pino';
import type { Config } from './config.js';
import type { Db } from './db/client.js';
import type { DrizzleSessionStore } from './auth/session-store.js';
import type { Mailer } from './mail/mailer.js';

/** What every route and service may use; built once in index.ts (or per test file). */
export interface AppContext {
  config: Config;
  db: Db;
  log: Logger;
  mailer: Mailer;
  sessionStore: DrizzleSessionStore;
  version: string;
  /** Origin used in links sent by e-mail when PUBLIC_URL is not set: taken from the request. */
  publicUrl(reqOrigin?: string): string;
}
