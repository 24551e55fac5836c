import { and, desc, eq, gt, isNull } from 'drizzle-orm';
import type { RequestHandler } from 'express';
import type { ApiTokenView, TokenCreateBody, TokenCreated } from '../../shared/tokens.js';
import type { AppContext } from '../context.js';
import { apiTokens } from '../db/schema.js';
import { HttpError, notFound } from '../http-error.js';
import { TOKEN_PREFIX } from '../auth/bearer.js';
import { newToken, sha256Hex } from '../auth/secret-tokens.js';
import { audit } from './audit.js';

const DAY_MS = 86_400_000;
const HOUR_MS = 3_600_000;
/** More active tokens than this per person is a sign of tokens being shared or forgotten. */
export const MAX_ACTIVE_TOKENS = 50;
/** Characters of the secret kept in clear so people can tell tokens apart (4 prefix + 8 random). */
const VISIBLE_PREFIX_LENGTH = TOKEN_PREFIX.length + 8;

type TokenRow = typeof apiTokens.$inferSelect;

export function toTokenView(row: TokenRow, now = Date.now()): ApiTokenView {
  const status = row.revokedAt !== null ? 'revoked' : row.expiresAt <= now ? 'expired' : 'active';
  return {
    id: row.id,
    name: row.name,
    prefix: row.prefix,
    scope: row.scope,
    status,
    expiresAt: row.expiresAt,
    revokedAt: row.revokedAt,
    lastUsedAt: row.lastUsedAt,
    createdAt: row.createdAt,
  };
}

export function listOwnTokens(ctx: AppContext, userId: number): ApiTokenView[] {
  const now = Date.now();
  return ctx.db
    .select()
    .from(apiTokens)
    .where(eq(apiTokens.userId, userId))
    .orderBy(desc(apiTokens.id))
    .all()
    .map((r) => toTokenView(r, now));
}

/** Creates a token; the secret is in the return value only — the database keeps its SHA-256. */
export function createToken(ctx: AppContext, userId: number, body: TokenCreateBody): TokenCreated {
  const now = Date.now();
  const secret = newToken(TOKEN_PREFIX);
  return ctx.db.transaction((tx) => {
    const active = tx
      .select({ id: apiTokens.id })
      .from(apiTokens)
      .where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt), gt(apiTokens.expiresAt, now)))
      .all().length;
    if (active >= MAX_ACTIVE_TOKENS) {
      throw new HttpError(409, `You already have ${active} active tokens (the limit is ${MAX_ACTIVE_TOKENS}); revoke unused ones first`);
    }
    const row = tx
      .insert(apiTokens)
      .values({
        userId,
        name: body.name,
        prefix: secret.slice(0, VISIBLE_PREFIX_LENGTH),
        tokenHash: sha256Hex(secret),
        scope: body.scope,
        expiresAt: now + body.expiresInDays * DAY_MS,
      })
      .returning()
      .get();
    audit(tx, {
      userId,
      entity: 'api-token',
      entityId: String(row.id),
      action: 'create',
      newValue: `${body.name} (${body.scope}, ${body.expiresInDays} days)`,
    });
    return { token: toTokenView(row, now), secret };
  });
}

/** Revokes one of the caller's own tokens; somebody else's token is reported as not found. */
export function revokeToken(ctx: AppContext, userId: number, tokenId: number): ApiTokenView {
  return ctx.db.transaction((tx) => {
    const row = tx.select().from(apiTokens).where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId))).get();
    if (!row) throw notFound(`The token ${tokenId}`);
    if (row.revokedAt !== null) return toTokenView(row);
    const revoked = tx.update(apiTokens).set({ revokedAt: Date.now() }).where(eq(apiTokens.id, tokenId)).returning().get();
    audit(tx, { userId, entity: 'api-token', entityId: String(tokenId), action: 'revoke', oldValue: row.name });
    return toTokenView(revoked);
  });
}

/** Token management needs a browser session: a token must not be able to mint or extend tokens. */
export const sessionOnly: RequestHandler = (req, _res, next) => {
  if (req.authViaToken) throw new HttpError(403, 'API tokens are managed from a signed-in browser session, not with a token');
  next();
};

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
const lastReadAudit = new WeakMap<AppContext, Map<number, number>>();

/**
 * Token use in the audit trail. Decision (documented in docs/automation.md):
 *  - every mutating call made with a token gets one row (`token-write`: method, path, status), so a
 *    script's changes can be traced to the token even where a service records only the user;
 *  - reads are sampled: one `token-read` row per token per clock hour, which shows that a token is
 *    alive without flooding the trail with run-sheet polling.
 * Rows are written when the response has finished so the status is known.
 */
export function tokenUseAudit(ctx: AppContext): RequestHandler {
  const seen = lastReadAudit.get(ctx) ?? new Map<number, number>();
  lastReadAudit.set(ctx, seen);
  return (req, res, next) => {
    const via = req.authViaToken;
    if (!via) return next();
    const write = !SAFE_METHODS.has(req.method);
    const hour = Math.floor(Date.now() / HOUR_MS);
    if (!write && seen.get(via.tokenId) === hour) return next();
    if (!write) seen.set(via.tokenId, hour);
    const path = req.originalUrl.split('?')[0] ?? req.originalUrl;
    res.once('finish', () => {
      audit(ctx.db, {
        userId: req.user?.id ?? null,
        tokenId: via.tokenId,
        studyId: req.study?.id ?? null,
        entity: 'api-token',
        entityId: String(via.tokenId),
        action: write ? 'token-write' : 'token-read',
        field: `${req.method} ${path}`,
        newValue: String(res.statusCode),
      });
    });
    next();
  };
}
