import { and, eq, gt, isNull } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { passwordResets, users } from '../db/schema.js';
import { HttpError } from '../http-error.js';
import { linkMail } from '../mail/mailer.js';
import { hashPassword } from '../auth/passwords.js';
import { newToken, sha256Hex } from '../auth/secret-tokens.js';
import { audit } from './audit.js';
import { findUserByEmail } from './users.js';

const RESET_MINUTES = 60;

/**
 * Sends a reset link if the address belongs to an active account. The caller always answers the same
 * way, so the endpoint does not reveal which addresses have accounts.
 */
export async function requestReset(ctx: AppContext, email: string, origin: string): Promise<void> {
  const user = findUserByEmail(ctx, email);
  if (!user || !user.active) {
    ctx.log.info({ email }, 'password reset requested for an unknown or inactive address');
    return;
  }
  const token = newToken();
  ctx.db.transaction((tx) => {
    tx.update(passwordResets).set({ usedAt: Date.now() }).where(and(eq(passwordResets.userId, user.id), isNull(passwordResets.usedAt))).run();
    tx.insert(passwordResets).values({ userId: user.id, tokenHash: sha256Hex(token), expiresAt: Date.now() + RESET_MINUTES * 60_000 }).run();
  });
  const url = `${ctx.publicUrl(origin)}/reset-password?token=${encodeURIComponent(token)}`;
  await ctx.mailer.send(
    linkMail(
      user.email,
      'Reset your Specimetry password',
      'Someone (hopefully you) asked to reset the password of your Specimetry account.',
      'Choose a new password',
      url,
      `The link works once and expires in ${RESET_MINUTES} minutes. If you did not ask for this, ignore this mail; your password stays as it is.`,
    ),
  );
}

/** Sets the new password, spends the token and ends every existing session of the account. */
export async function confirmReset(ctx: AppContext, token: string, password: string): Promise<void> {
  const passwordHash = await hashPassword(password);
  const userId = ctx.db.transaction((tx) => {
    const row = tx
      .select()
      .from(passwordResets)
      .where(and(eq(passwordResets.tokenHash, sha256Hex(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, Date.now())))
      .get();
    if (!row) throw new HttpError(400, 'This reset link is not valid any more (used, replaced or expired). Ask for a new one.');
    tx.update(passwordResets).set({ usedAt: Date.now() }).where(eq(passwordResets.id, row.id)).run();
    tx.update(users).set({ passwordHash, updatedAt: Date.now() }).where(eq(users.id, row.userId)).run();
    audit(tx, { userId: row.userId, entity: 'user', entityId: String(row.userId), action: 'password-reset' });
    return row.userId;
  });
  ctx.sessionStore.destroyForUser(userId);
}
