import type { Request } from 'express';
import type { Role } from '../../shared/roles.js';
import type { AuditEntry } from './audit.js';

/** Who is making a change: recorded on every audit row (token calls carry the token id as well). */
export interface Actor {
  userId: number;
  tokenId: number | null;
  role: Role;
}

export function actorOf(req: Request): Actor {
  const user = req.user;
  // Every caller of this helper sits behind a policy that has already required a signed-in user.
  if (!user) throw new Error('actorOf() called on a request without a user');
  return { userId: user.id, tokenId: req.authViaToken?.tokenId ?? null, role: user.role };
}

/** The audit columns that identify the actor. */
export function by(actor: Actor): Pick<AuditEntry, 'userId' | 'tokenId'> {
  return { userId: actor.userId, tokenId: actor.tokenId };
}
