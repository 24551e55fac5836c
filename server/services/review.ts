import { and, eq, inArray } from 'drizzle-orm';
import type { ReviewRequestBody, ReviewRequestItem } from '../../shared/analysis.js';
import type { AppContext } from '../context.js';
import type { Db } from '../db/client.js';
import { analyses, reviewRequests, studyMembers, users } from '../db/schema.js';
import { HttpError } from '../http-error.js';
import { linkMail } from '../mail/mailer.js';
import { by, type Actor } from './actor.js';
import { analysisLink, freshness, studyOfAnalysis, type AnalysisRow, type Freshness } from './analysis.js';
import { audit, type DbOrTx } from './audit.js';
import { notify } from './notifications.js';
import { autoAdvance } from './studies.js';
import type { StudyStatus } from '../../shared/studies.js';

/**
 * Review and sign-off. The four-eyes rule: a supervisor who is a reviewer of the study signs off,
 * and never the study's owner or the person who saved the analysis. Approval re-checks the data
 * hash in the same transaction that freezes the analysis, so nothing can slip in between.
 */

export function listReviewRequests(db: DbOrTx, analysisId: number): ReviewRequestItem[] {
  const rows = db
    .select({ id: reviewRequests.id, reviewerId: reviewRequests.reviewerId, requestedBy: reviewRequests.requestedBy, message: reviewRequests.message, createdAt: reviewRequests.createdAt })
    .from(reviewRequests)
    .where(eq(reviewRequests.analysisId, analysisId))
    .orderBy(reviewRequests.id)
    .all();
  const ids = [...new Set(rows.flatMap((r) => [r.reviewerId, r.requestedBy]))];
  const people = new Map(ids.length ? db.select({ id: users.id, name: users.name, role: users.role }).from(users).where(inArray(users.id, ids)).all().map((u) => [u.id, u]) : []);
  return rows.map((r) => {
    const reviewer = people.get(r.reviewerId);
    const requester = people.get(r.requestedBy);
    return {
      id: r.id,
      reviewer: { id: r.reviewerId, name: reviewer?.name ?? `user ${r.reviewerId}`, role: reviewer?.role ?? 'unknown' },
      requestedBy: { id: r.requestedBy, name: requester?.name ?? `user ${r.requestedBy}` },
      message: r.message,
      createdAt: r.createdAt,
    };
  });
}

/** Study statuses move along with the analysis; a study elsewhere in its workflow is left alone. */
function advanceStudy(tx: DbOrTx, actor: Actor, studyId: number, from: StudyStatus[], to: StudyStatus, why: string): void {
  for (const f of from) autoAdvance(tx, actor, studyId, f, to, why);
}

export async function requestReview(ctx: AppContext, actor: Actor, row: AnalysisRow, body: ReviewRequestBody, origin: string) {
  const db = ctx.db;
  if (row.status === 'approved') throw new HttpError(409, `Analysis ${row.id} is already approved; save a new analysis to review a change`);
  const fresh = freshness(db, row);
  if (fresh.stale) throw new HttpError(409, `The data of analysis ${row.id} have changed since it was saved; save a new analysis and request a review of that`, { current: { changes: fresh.changes } });
  const members = db
    .select({ userId: users.id, name: users.name, email: users.email, accountRole: users.role, active: users.active, role: studyMembers.role })
    .from(studyMembers)
    .innerJoin(users, eq(users.id, studyMembers.userId))
    .where(and(eq(studyMembers.studyId, row.studyId), inArray(studyMembers.userId, body.reviewerIds)))
    .all();
  const reviewers = body.reviewerIds.map((id, i) => {
    const m = members.find((x) => x.userId === id);
    const bad = (why: string) => new HttpError(400, `reviewerIds.${i}: user ${id} ${why}`, { details: [{ path: `reviewerIds.${i}`, message: why }] });
    if (!m) throw bad('is not a member of this study');
    if (m.role !== 'reviewer') throw bad(`is ${m.role} in this study; a review goes to members with the reviewer role`);
    if (m.accountRole !== 'statistician' && m.accountRole !== 'supervisor') throw bad(`is a ${m.accountRole}; reviewers are statisticians or supervisors`);
    if (!m.active) throw bad('has a deactivated account');
    return m;
  });
  const unique = [...new Map(reviewers.map((r) => [r.userId, r])).values()];
  const study = studyOfAnalysis(db, row.id);
  const link = analysisLink(row.studyId, row.id);
  db.transaction((tx) => {
    tx.insert(reviewRequests).values(unique.map((r) => ({ analysisId: row.id, reviewerId: r.userId, requestedBy: actor.userId, message: body.message }))).run();
    tx.update(analyses).set({ status: 'in_review' }).where(eq(analyses.id, row.id)).run();
    for (const r of unique) {
      audit(tx, { ...by(actor), studyId: row.studyId, entity: 'analysis', entityId: String(row.id), action: 'review-request', field: 'reviewer', newValue: `${r.name} <${r.email}>`, reason: body.message || null });
    }
    if (row.status !== 'in_review') audit(tx, { ...by(actor), studyId: row.studyId, entity: 'analysis', entityId: String(row.id), action: 'status', field: 'status', oldValue: row.status, newValue: 'in_review' });
    advanceStudy(tx, actor, row.studyId, ['analysed', 'collecting'], 'in_review', `review of analysis ${row.id} requested`);
    notify(tx, unique.map((r) => r.userId), 'review-request', `Review requested: "${row.title}" in study "${study.title}"`, link);
  });
  const url = `${ctx.publicUrl(origin)}${link}`;
  let mailed = 0;
  for (const r of unique) {
    try {
      await ctx.mailer.send(
        linkMail(
          r.email,
          `Review requested: ${row.title}`,
          `You are asked to review the analysis "${row.title}" of the study "${study.title}".${body.message ? ` Message: ${body.message}` : ''}`,
          'Open the analysis',
          url,
          'You can comment on the whole analysis or on single table rows and charts. Statistics inform; they do not replace qualified engineering judgement, the applicable test standards, or local codes and licensed practice.',
        ),
      );
      mailed++;
    } catch (err) {
      // Expected failure: the SMTP server is unreachable. The request and the in-app notification
      // (with the same link) already stand, so the call succeeds and reports how many mails went out.
      ctx.log.warn({ err, to: r.email }, 'review request mail not sent');
    }
  }
  return { reviewRequests: listReviewRequests(db, row.id), mailed };
}

/** Why this caller may not sign off (status, message), or null when they may. */
export function approvalRefusal(actor: Actor, studyRole: string, row: AnalysisRow, ownerId: number, fresh: Freshness): { status: number; message: string } | null {
  if (actor.role !== 'supervisor') return { status: 403, message: `Only a supervisor signs off an analysis; you are signed in as ${actor.role}` };
  if (studyRole !== 'reviewer') return { status: 403, message: `Sign-off needs the study role reviewer; you are ${studyRole} in this study` };
  if (actor.userId === ownerId) return { status: 403, message: 'You own this study; another supervisor must sign off its analysis' };
  if (actor.userId === row.createdBy) return { status: 403, message: 'You saved this analysis; sign-off needs a second person' };
  if (row.status === 'approved') return { status: 409, message: `Analysis ${row.id} is already approved; to approve a change, save a new analysis and have it reviewed` };
  if (row.status === 'draft') return { status: 409, message: `Analysis ${row.id} is a draft; the owner requests a review first` };
  if (row.status === 'returned') return { status: 409, message: `Analysis ${row.id} was returned; the owner requests a new review first` };
  if (fresh.stale) return { status: 409, message: `The data of analysis ${row.id} have changed since it was saved (hash ${fresh.currentHash.slice(0, 12)}… instead of ${row.dataHash.slice(0, 12)}…); it cannot be approved — save a new analysis` };
  return null;
}

export function approveAnalysis(db: Db, actor: Actor, studyRole: string, row: AnalysisRow, note?: string): void {
  db.transaction((tx) => {
    // Inside the transaction: the hash is re-computed against exactly what is committed now.
    const current = tx.select().from(analyses).where(eq(analyses.id, row.id)).get()!;
    const study = studyOfAnalysis(db, row.id);
    const fresh = freshness(db, current);
    const refusal = approvalRefusal(actor, studyRole, current, study.ownerId, fresh);
    if (refusal) throw new HttpError(refusal.status, refusal.message, fresh.stale ? { current: { changes: fresh.changes } } : undefined);
    const approvedAt = Date.now();
    tx.update(analyses).set({ status: 'approved', approvedBy: actor.userId, approvedAt }).where(eq(analyses.id, row.id)).run();
    audit(tx, { ...by(actor), studyId: row.studyId, entity: 'analysis', entityId: String(row.id), action: 'approve', field: 'status', oldValue: current.status, newValue: 'approved', reason: note ?? `data hash ${current.dataHash}` });
    advanceStudy(tx, actor, row.studyId, ['in_review', 'analysed'], 'approved', `analysis ${row.id} approved`);
    notify(tx, [study.ownerId, current.createdBy].filter((id) => id !== actor.userId), 'approved', `Approved: "${current.title}" in study "${study.title}"`, analysisLink(row.studyId, row.id));
  });
}

/** Sign-off and return are a supervisor reviewer's acts; admins pass the study policy but not this. */
export function requireSignOffRole(actor: Actor, studyRole: string, what: string): void {
  if (actor.role !== 'supervisor') throw new HttpError(403, `Only a supervisor ${what} an analysis; you are signed in as ${actor.role}`);
  if (studyRole !== 'reviewer') throw new HttpError(403, `This needs the study role reviewer; you are ${studyRole} in this study`);
}

export function returnAnalysis(db: Db, actor: Actor, studyRole: string, row: AnalysisRow, reason: string): void {
  requireSignOffRole(actor, studyRole, 'returns');
  if (row.status !== 'in_review') throw new HttpError(409, `Analysis ${row.id} is ${row.status.replace('_', ' ')}; only an analysis in review can be returned`);
  const study = studyOfAnalysis(db, row.id);
  db.transaction((tx) => {
    tx.update(analyses).set({ status: 'returned', returnedReason: reason }).where(eq(analyses.id, row.id)).run();
    audit(tx, { ...by(actor), studyId: row.studyId, entity: 'analysis', entityId: String(row.id), action: 'return', field: 'status', oldValue: row.status, newValue: 'returned', reason });
    advanceStudy(tx, actor, row.studyId, ['in_review'], 'analysed', `analysis ${row.id} returned: ${reason}`);
    notify(tx, [study.ownerId, row.createdBy].filter((id) => id !== actor.userId), 'returned', `Returned: "${row.title}" — ${reason}`, analysisLink(row.studyId, row.id));
  });
}
