import { and, eq, notInArray } from 'drizzle-orm';
import type { MemberBody } from '../../shared/studies.js';
import type { Role, StudyRole } from '../../shared/roles.js';
import type { Db } from '../db/client.js';
import { studies, studyMembers, users } from '../db/schema.js';
import { HttpError } from '../http-error.js';
import { audit, type DbOrTx } from './audit.js';
import { by, type Actor } from './actor.js';

/**
 * Which account roles may hold which study role. Reviewers check and sign (statistician,
 * supervisor); owners and contributors set up and record (engineers); anyone may watch.
 */
export const STUDY_ROLE_ACCOUNTS: Record<StudyRole, readonly Role[] | null> = {
  owner: ['engineer'],
  contributor: ['engineer'],
  reviewer: ['statistician', 'supervisor'],
  viewer: null,
};

export function listMembers(db: DbOrTx, studyId: number) {
  return db
    .select({ userId: users.id, name: users.name, email: users.email, accountRole: users.role, role: studyMembers.role, addedAt: studyMembers.addedAt })
    .from(studyMembers)
    .innerJoin(users, eq(users.id, studyMembers.userId))
    .where(eq(studyMembers.studyId, studyId))
    .orderBy(studyMembers.addedAt, users.name)
    .all();
}

/** Active accounts that are not yet members: what the "add member" picker offers. */
export function memberCandidates(db: Db, studyId: number) {
  const memberIds = db.select({ id: studyMembers.userId }).from(studyMembers).where(eq(studyMembers.studyId, studyId)).all().map((m) => m.id);
  return db
    .select({ id: users.id, name: users.name, email: users.email, role: users.role })
    .from(users)
    .where(and(eq(users.active, true), memberIds.length ? notInArray(users.id, memberIds) : undefined))
    .orderBy(users.name)
    .all()
    .filter((u) => u.role !== 'admin');
}

export function upsertMember(db: Db, actor: Actor, studyId: number, body: MemberBody): void {
  const user = body.userId !== undefined
    ? db.select().from(users).where(eq(users.id, body.userId)).get()
    : db.select().from(users).where(eq(users.email, body.email!)).get();
  const who = body.userId !== undefined ? `userId ${body.userId}` : `e-mail ${body.email}`;
  if (!user || !user.active) throw new HttpError(400, `${who}: no active account`, { details: [{ path: body.userId !== undefined ? 'userId' : 'email', message: 'Unknown user' }] });
  const allowed = STUDY_ROLE_ACCOUNTS[body.role];
  if (allowed && !allowed.includes(user.role)) {
    throw new HttpError(400, `${user.name} is a ${user.role}; a study ${body.role} must be ${allowed.join(' or ')}`, { details: [{ path: 'role', message: `Needs a ${allowed.join(' or ')} account` }] });
  }
  db.transaction((tx) => {
    const existing = tx.select().from(studyMembers).where(and(eq(studyMembers.studyId, studyId), eq(studyMembers.userId, user.id))).get();
    if (existing?.role === body.role) return;
    if (existing?.role === 'owner') throw new HttpError(400, `${user.name} owns the study: make another engineer owner first (ownership moves, it is never left empty)`);
    if (body.role === 'owner') {
      // Exactly one owner: the previous owner stays on the study as contributor.
      const study = tx.select().from(studies).where(eq(studies.id, studyId)).get()!;
      tx.update(studyMembers).set({ role: 'contributor' }).where(and(eq(studyMembers.studyId, studyId), eq(studyMembers.userId, study.ownerId))).run();
      tx.update(studies).set({ ownerId: user.id, updatedAt: Date.now() }).where(eq(studies.id, studyId)).run();
      audit(tx, { ...by(actor), studyId, entity: 'study', entityId: String(studyId), action: 'owner', field: 'ownerId', oldValue: String(study.ownerId), newValue: String(user.id) });
    }
    if (existing) tx.update(studyMembers).set({ role: body.role }).where(and(eq(studyMembers.studyId, studyId), eq(studyMembers.userId, user.id))).run();
    else tx.insert(studyMembers).values({ studyId, userId: user.id, role: body.role }).run();
    audit(tx, { ...by(actor), studyId, entity: 'member', entityId: String(user.id), action: existing ? 'role' : 'add', field: 'role', oldValue: existing?.role ?? null, newValue: body.role });
  });
}

export function removeMember(db: Db, actor: Actor, studyId: number, userId: number): void {
  db.transaction((tx) => {
    const existing = tx.select().from(studyMembers).where(and(eq(studyMembers.studyId, studyId), eq(studyMembers.userId, userId))).get();
    if (!existing) throw new HttpError(400, `userId ${userId} is not a member of this study`, { details: [{ path: 'userId', message: 'Not a member' }] });
    if (existing.role === 'owner') throw new HttpError(400, 'The owner cannot be removed: make another engineer owner first');
    tx.delete(studyMembers).where(and(eq(studyMembers.studyId, studyId), eq(studyMembers.userId, userId))).run();
    audit(tx, { ...by(actor), studyId, entity: 'member', entityId: String(userId), action: 'remove', field: 'role', oldValue: existing.role, newValue: null });
  });
}
