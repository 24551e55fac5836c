import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';

const boolFromEnv = z
  .enum(['0', '1', 'true', 'false', 'yes', 'no'])
  .transform((v) => v === '1' || v === 'true' || v === 'yes');

const envSchema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default('127.0.0.1'),
  DATA_DIR: z.string().min(1).default('./data'),
  PUBLIC_URL: z.url().optional(),
  SESSION_SECRET: z.string().min(32, 'SESSION_SECRET must be at least 32 characters').optional(),
  DEMO: boolFromEnv.default(true),
  SMTP_HOST: z.string().optional(),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).optional(),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: boolFromEnv.default(false),
  MAIL_FROM: z.string().default('Specimetry <no-reply@specimetry.test>'),
  FAKE_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(0),
  TRUST_PROXY: boolFromEnv.default(false),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  LOGIN_LIMIT_PER_ACCOUNT: z.coerce.number().int().min(1).default(10),
  LOGIN_LIMIT_PER_IP: z.coerce.number().int().min(1).default(50),
  MAX_UPLOAD_MB: z.coerce.number().positive().default(25),
});

export type Config = {
  port: number;
  host: string;
  dataDir: string;
  publicUrl: string | undefined;
  sessionSecret: string;
  demo: boolean;
  smtp: { host: string; port: number; user?: string; password?: string; secure: boolean } | null;
  mailFrom: string;
  fakeSmtpPort: number;
  trustProxy: boolean;
  logLevel: z.infer<typeof envSchema>['LOG_LEVEL'];
  loginLimitPerAccount: number;
  loginLimitPerIp: number;
  maxUploadBytes: number;
};

export class ConfigError extends Error {
  override readonly name = 'ConfigError';
}

/**
 * Reads and validates the environment once at start-up; fails fast with every problem listed.
 * The session secret is generated on first start and kept in DATA_DIR so sessions survive restarts.
 */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.') || '(env)'}: ${i.message}`);
    throw new ConfigError(`Invalid configuration:\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  if (e.SMTP_HOST && !e.SMTP_PORT) throw new ConfigError('Invalid configuration:\n  SMTP_PORT: required when SMTP_HOST is set');
  const dataDir = path.resolve(e.DATA_DIR);
  mkdirSync(dataDir, { recursive: true });
  return {
    port: e.PORT,
    host: e.HOST,
    dataDir,
    publicUrl: e.PUBLIC_URL?.replace(/\/$/, ''),
    sessionSecret: e.SESSION_SECRET ?? persistedSecret(dataDir),
    demo: e.DEMO,
    smtp: e.SMTP_HOST
      ? { host: e.SMTP_HOST, port: e.SMTP_PORT ?? 587, user: e.SMTP_USER, password: e.SMTP_PASSWORD, secure: e.SMTP_SECURE }
      : null,
    mailFrom: e.MAIL_FROM,
    fakeSmtpPort: e.FAKE_SMTP_PORT,
    trustProxy: e.TRUST_PROXY,
    logLevel: e.LOG_LEVEL,
    loginLimitPerAccount: e.LOGIN_LIMIT_PER_ACCOUNT,
    loginLimitPerIp: e.LOGIN_LIMIT_PER_IP,
    maxUploadBytes: Math.round(e.MAX_UPLOAD_MB * 1024 * 1024),
  };
}

function persistedSecret(dataDir: string): string {
  const file = path.join(dataDir, 'session-secret');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  const secret = randomBytes(48).toString('base64url');
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}
