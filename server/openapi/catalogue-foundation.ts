import { z } from 'zod';
import {
  acceptInvitationBody,
  changePasswordBody,
  invitationBody,
  loginBody,
  publicUser,
  resetConfirmBody,
  resetRequestBody,
  userPatchBody,
} from '../../shared/auth.js';
import { apiTokenView, tokenCreateBody, tokenCreated } from '../../shared/tokens.js';
import { op, type OperationDoc } from './catalogue.js';

const userEnvelope = z.object({ user: publicUser.meta({ id: 'User' }) });

/** System, sign-in, accounts, invitations and personal access tokens. */
export const FOUNDATION_OPERATIONS: OperationDoc[] = [
  op('GET /health', 'System', 'Health, version and database migration level', {
    response: z.object({ status: z.enum(['ok', 'degraded']), db: z.enum(['ok', 'error']), version: z.string(), migrations: z.object({ applied: z.number(), latest: z.string() }).nullable() }),
    errors: { 503: 'The database does not answer' },
  }),
  op('GET /config', 'System', 'Public client configuration (version, demo mode, mail fake)', {
    response: z.object({ version: z.string(), mailFake: z.boolean(), demo: z.boolean() }),
  }),
  op('GET /mail/outbox', 'System', 'Messages caught by the built-in test mail server', { description: 'Exists only while the built-in fake SMTP server is active (404 otherwise).' }),
  op('GET /mail/outbox/:id', 'System', 'One caught message with its text and HTML body'),

  op('POST /auth/login', 'Sign-in', 'Sign in with e-mail and password (starts a cookie session)', {
    body: loginBody,
    response: userEnvelope,
    description: 'A fresh session id is issued on success (session fixation defence) and a new XSRF-TOKEN cookie is set. Rate-limited per account and per address.',
    errors: { 429: 'Too many attempts; Retry-After says when to try again' },
  }),
  op('POST /auth/logout', 'Sign-in', 'Sign out and destroy the session', { status: 204 }),
  op('GET /me', 'Sign-in', 'The signed-in user (and whether the call used an API token)', {
    response: userEnvelope.extend({ viaToken: z.boolean() }),
  }),
  op('POST /auth/password-reset', 'Sign-in', 'Request a password-reset link by e-mail', { body: resetRequestBody, status: 202 }),
  op('POST /auth/password-reset/confirm', 'Sign-in', 'Set a new password with the link\'s token', { body: resetConfirmBody, status: 204 }),
  op('POST /account/password', 'Sign-in', 'Change your own password', { body: changePasswordBody, status: 204 }),

  op('GET /users', 'Users', 'All accounts (admin)'),
  op('PATCH /users/:id', 'Users', 'Change role, name or active state of an account (admin)', { body: userPatchBody, response: userEnvelope }),
  op('GET /invitations', 'Users', 'Invitations sent (admin)'),
  op('POST /invitations', 'Users', 'Invite a person by e-mail with a role (admin)', { body: invitationBody, status: 201, errors: { 409: 'The address already has an account' } }),
  op('GET /invitations/lookup', 'Users', 'What an invitation link is for (before accepting)', { query: z.object({ token: z.string() }) }),
  op('POST /invitations/accept', 'Users', 'Accept an invitation: choose name and password, get signed in', { body: acceptInvitationBody, status: 201, response: userEnvelope }),

  op('GET /tokens', 'API tokens', 'Your personal access tokens (never their secrets)', {
    response: z.object({ tokens: z.array(apiTokenView) }),
    description: 'Token management needs a browser session; calls made with a token are refused (403).',
  }),
  op('POST /tokens', 'API tokens', 'Create a personal access token; the secret is shown once', {
    body: tokenCreateBody,
    status: 201,
    response: tokenCreated,
    description: 'Use the secret as `Authorization: Bearer spm_…`. A read token may call GET routes only; a write token may call every route your role allows. Only a SHA-256 of the secret is stored.',
    errors: { 409: 'Too many active tokens' },
  }),
  op('DELETE /tokens/:id', 'API tokens', 'Revoke one of your tokens (takes effect at once)', { response: z.object({ token: apiTokenView }) }),
];
