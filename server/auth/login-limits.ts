import type { RequestHandler } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import type { Config } from '../config.js';
import { HttpError } from '../http-error.js';

const WINDOW_MS = 15 * 60 * 1000;

function limited(minutes: number, what: string) {
  return new HttpError(429, `Too many sign-in attempts ${what}. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`, {
    retryAfterSeconds: minutes * 60,
  });
}

/**
 * Two limits on POST /api/auth/login, both over 15 minutes: per account (slows guessing one
 * password) and per IP address (slows trying many accounts). Successful sign-ins do not count.
 */
export function loginLimits(config: Config): RequestHandler[] {
  const common = { windowMs: WINDOW_MS, standardHeaders: 'draft-8' as const, legacyHeaders: false, skipSuccessfulRequests: true };
  const perAccount = rateLimit({
    ...common,
    limit: config.loginLimitPerAccount,
    keyGenerator: (req) => `acct:${String((req.body as { email?: unknown })?.email ?? '').trim().toLowerCase()}`,
    handler: (req, _res, next) => next(limited(minutesLeft(req), 'for this account')),
  });
  const perIp = rateLimit({
    ...common,
    limit: config.loginLimitPerIp,
    keyGenerator: (req) => `ip:${ipKeyGenerator(req.ip ?? '')}`,
    handler: (req, _res, next) => next(limited(minutesLeft(req), 'from your network address')),
  });
  return [perIp, perAccount];
}

function minutesLeft(req: Parameters<RequestHandler>[0]): number {
  const info = (req as { rateLimit?: { resetTime?: Date } }).rateLimit;
  const ms = info?.resetTime ? info.resetTime.getTime() - Date.now() : WINDOW_MS;
  return Math.max(1, Math.ceil(ms / 60_000));
}
