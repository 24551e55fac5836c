import { z } from 'zod';

/** Longest life a personal access token may have: a forgotten script token should not live for ever. */
export const TOKEN_MAX_DAYS = 365;
export const TOKEN_SCOPES = ['read', 'write'] as const;
export type TokenScope = (typeof TOKEN_SCOPES)[number];

export const tokenCreateBody = z
  .object({
    name: z.string().trim().min(1, 'Give the token a name, e.g. the script that will use it').max(80, 'Use at most 80 characters'),
    scope: z.enum(TOKEN_SCOPES, { message: 'Choose read or write' }),
    expiresInDays: z
      .number({ message: 'Give the lifetime in whole days' })
      .int('Give the lifetime in whole days')
      .min(1, 'A token must live at least 1 day')
      .max(TOKEN_MAX_DAYS, `A token may live at most ${TOKEN_MAX_DAYS} days`),
  })
  .meta({ id: 'TokenCreate', description: 'A new personal access token for scripts' });
export type TokenCreateBody = z.infer<typeof tokenCreateBody>;

export const apiTokenView = z
  .object({
    id: z.number().int(),
    name: z.string(),
    /** The first characters of the secret, so the owner can tell tokens apart; never enough to use. */
    prefix: z.string(),
    scope: z.enum(TOKEN_SCOPES),
    status: z.enum(['active', 'expired', 'revoked']),
    expiresAt: z.number().int(),
    revokedAt: z.number().int().nullable(),
    lastUsedAt: z.number().int().nullable(),
    createdAt: z.number().int(),
  })
  .meta({ id: 'ApiToken' });
export type ApiTokenView = z.infer<typeof apiTokenView>;

export const tokenCreated = z
  .object({
    token: apiTokenView,
    /** The secret, returned exactly once; only its SHA-256 is stored. */
    secret: z.string(),
  })
  .meta({ id: 'TokenCreated' });
export type TokenCreated = z.infer<typeof tokenCreated>;
