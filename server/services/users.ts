import { eq } from 'drizzle-orm';
import type { PublicUser } from '../../shared/auth.js';
import type { Role } from '../../shared/roles.js';
import type { AppContext } from '../context.js';
import { users } from '../db/schema.js';
import { HttpError, notFound } from '../http-error.js';
import { hashPassword, verifyPassword } from '../auth/passwords.js';
import { audit } from './audit.js';

type UserRow = typeof users.$inferSelect;

export function toPublicUser(u: UserRow): PublicUser {
  return { id: u.id, email: u.email, name: u.name, role: u.role, active: u.active };
}

export function findUserByEmail(ctx: AppContext, email: string): UserRow | undefined {
  return ctx.db.select().from(users).where(eq(users.email, email.toLowerCase())).get();
}

export function findUser(ctx: AppContext, id: number): UserRow | undefined {
  return ctx.db.select().from(users).where(eq(users.id, id)).get();
}

export async function createUser(ctx: AppContext, input: { email: string; name: string; role: Role; password: string }): Promise<UserRow> {
  if (findUserByEmail(ctx, input.email)) throw new HttpError(409, `An account for ${input.email} already exists`);
  const passwordHash = await hashPassword(input.password);
  return ctx.db.insert(users).values({ email: input.email.toLowerCase(), name: input.name, role: input.role, passwordHash }).returning().get();
}

export function listUsers(ctx: AppContext) {
  return ctx.db
    .select()
    .from(users)
    .orderBy(users.email)
    .all()
    .map((u) => ({ ...toPublicUser(u), createdAt: u.createdAt }));
}

/** Role change / (de)activation by an admin; deactivation ends every session of that user at once. */
export function patchUser(ctx: AppContext, actorId: number, id: number, patch: { role?: Role; active?: boolean; name?: string }): PublicUser {
  const before = findUser(ctx, id);
  if (!before) throw notFound('The user');
  if (id === actorId && (patch.active === false || (patch.role && patch.role !== 'admin'))) {
    throw new HttpError(400, 'You cannot deactivate your own account or remove your own admin role; ask another admin');
  }
  const after = ctx.db.transaction((tx) => {
    const row = tx.update(users).set({ ...patch, updatedAt: Date.now() }).where(eq(users.id, id)).returning().get();
    for (const key of ['role', 'active', 'name'] as const) {
      if (patch[key] !== undefined && patch[key] !== before[key]) {
        audit(tx, { userId: actorId, entity: 'user', entityId: String(id), action: 'update', field: key, oldValue: String(before[key]), newValue: String(patch[key]) });
      }
    }
    return row;
  });
  if (patch.active === false) ctx.sessionStore.destroyForUser(id);
  return toPublicUser(after);
}

export async function changePassword(ctx: AppContext, userId: number, current: string, next: string): Promise<void> {
  const user = findUser(ctx, userId);
  if (!user) throw notFound('The user');
  if (!(await verifyPassword(user.passwordHash, current))) {
    throw new HttpError(400, 'The current password is not correct', { details: [{ path: 'currentPassword', message: 'Not correct' }] });
  }
  const passwordHash = await hashPassword(next);
  ctx.db.transaction((tx) => {
    tx.update(users).set({ passwordHash, updatedAt: Date.now() }).where(eq(users.id, userId)).run();
    audit(tx, { userId, entity: 'user', entityId: String(userId), action: 'password-changed' });
  });
}
