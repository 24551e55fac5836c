import { and, desc, eq, gt, isNull } from 'drizzle-orm';
import type { InvitationBody } from '../../shared/auth.js';
import type { AppContext } from '../context.js';
import { invitations, users } from '../db/schema.js';
import { HttpError } from '../http-error.js';
import { linkMail } from '../mail/mailer.js';
import { hashPassword } from '../auth/passwords.js';
import { newToken, sha256Hex } from '../auth/secret-tokens.js';
import { audit } from './audit.js';
import { findUserByEmail } from './users.js';

const INVITATION_DAYS = 7;

export function listInvitations(ctx: AppContext) {
  return ctx.db
    .select({
      id: invitations.id,
      email: invitations.email,
      name: invitations.name,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      acceptedAt: invitations.acceptedAt,
      revokedAt: invitations.revokedAt,
      createdAt: invitations.createdAt,
    })
    .from(invitations)
    .orderBy(desc(invitations.createdAt))
    .all();
}

/** Creates a single-use invitation (7 days) and mails its link. Only the token's hash is stored. */
export async function invite(ctx: AppContext, actorId: number, body: InvitationBody, origin: string) {
  if (findUserByEmail(ctx, body.email)) throw new HttpError(409, `${body.email} already has an account`);
  const token = newToken();
  const row = ctx.db.transaction((tx) => {
    // A new invitation replaces any open one for the same address, so only the newest link works.
    tx.update(invitations)
      .set({ revokedAt: Date.now() })
      .where(and(eq(invitations.email, body.email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
      .run();
    const inserted = tx
      .insert(invitations)
      .values({ email: body.email, name: body.name ?? null, role: body.role, tokenHash: sha256Hex(token), invitedBy: actorId, expiresAt: Date.now() + INVITATION_DAYS * 86_400_000 })
      .returning()
      .get();
    audit(tx, { userId: actorId, entity: 'invitation', entityId: String(inserted.id), action: 'create', newValue: `${body.email} as ${body.role}` });
    return inserted;
  });
  const url = `${ctx.publicUrl(origin)}/accept-invitation?token=${encodeURIComponent(token)}`;
  await ctx.mailer.send(
    linkMail(
      body.email,
      'You are invited to Specimetry',
      `You have been invited to Specimetry as ${body.role}. Choose a name and password to activate your account.`,
      'Accept the invitation',
      url,
      `The link works once and expires in ${INVITATION_DAYS} days. If you did not expect this mail, ignore it.`,
    ),
  );
  const { tokenHash: _omit, ...invitation } = row;
  return invitation;
}

function openInvitation(ctx: AppContext, token: string) {
  const row = ctx.db.select().from(invitations).where(eq(invitations.tokenHash, sha256Hex(token))).get();
  if (!row) throw new HttpError(404, 'This invitation link is not valid. Ask an administrator for a new one.');
  if (row.acceptedAt) throw new HttpError(410, 'This invitation has already been used. Sign in instead.');
  if (row.revokedAt) throw new HttpError(410, 'This invitation was replaced or withdrawn. Ask an administrator for a new one.');
  if (row.expiresAt <= Date.now()) throw new HttpError(410, 'This invitation has expired. Ask an administrator for a new one.');
  return row;
}

export function lookupInvitation(ctx: AppContext, token: string) {
  const row = openInvitation(ctx, token);
  return { email: row.email, role: row.role, name: row.name };
}

export async function acceptInvitation(ctx: AppContext, token: string, name: string, password: string) {
  openInvitation(ctx, token);
  const passwordHash = await hashPassword(password);
  return ctx.db.transaction((tx) => {
    // Re-check inside the transaction: two clicks on the same link must create one account.
    const row = tx
      .select()
      .from(invitations)
      .where(and(eq(invitations.tokenHash, sha256Hex(token)), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, Date.now())))
      .get();
    if (!row) throw new HttpError(410, 'This invitation is no longer valid');
    if (tx.select({ id: users.id }).from(users).where(eq(users.email, row.email)).get()) {
      throw new HttpError(409, `${row.email} already has an account`);
    }
    const user = tx.insert(users).values({ email: row.email, name, role: row.role, passwordHash }).returning().get();
    tx.update(invitations).set({ acceptedAt: Date.now() }).where(eq(invitations.id, row.id)).run();
    audit(tx, { userId: user.id, entity: 'invitation', entityId: String(row.id), action: 'accept' });
    return user;
  });
}
