import { and, eq, isNull } from 'drizzle-orm';
import type { RequestHandler } from 'express';
import type { AppContext } from '../context.js';
import { apiTokens, users } from '../db/schema.js';
import { HttpError } from '../http-error.js';
import { toPublicUser } from '../services/users.js';
import { sha256Hex } from './secret-tokens.js';

export const TOKEN_PREFIX = 'spm_';

/**
 * `Authorization: Bearer spm_…` authenticates a script as the token's owner with the owner's own
 * permissions, limited by the token's scope. A bad, expired or revoked token is a 401 — never a
 * silent fall-back to the cookie session.
 */
export function bearerAuth(ctx: AppContext): RequestHandler {
  return (req, _res, next) => {
    const header = req.get('authorization');
    if (!header) return next();
    const match = /^Bearer\s+(\S+)$/i.exec(header);
    if (!match) throw new HttpError(401, 'The Authorization header must be "Bearer <token>"');
    const token = match[1]!;
    const row = ctx.db
      .select({ token: apiTokens, user: users })
      .from(apiTokens)
      .innerJoin(users, eq(users.id, apiTokens.userId))
      .where(and(eq(apiTokens.tokenHash, sha256Hex(token)), isNull(apiTokens.revokedAt)))
      .get();
    if (!row) throw new HttpError(401, 'The API token is not valid (unknown or revoked)');
    if (row.token.expiresAt <= Date.now()) throw new HttpError(401, 'The API token has expired; create a new one on your account page');
    if (!row.user.active) throw new HttpError(401, 'The account behind this API token is deactivated');
    ctx.db.update(apiTokens).set({ lastUsedAt: Date.now() }).where(eq(apiTokens.id, row.token.id)).run();
    req.user = toPublicUser(row.user);
    req.authViaToken = { tokenId: row.token.id, scope: row.token.scope };
    next();
  };
}
