import { and, asc, eq, inArray } from 'drizzle-orm';
import type { CommentBody, CommentItem, CommentThread } from '../../shared/analysis.js';
import type { Db } from '../db/client.js';
import { comments, users } from '../db/schema.js';
import { HttpError, notFound } from '../http-error.js';
import { by, type Actor } from './actor.js';
import { analysisLink, studyOfAnalysis, type AnalysisRow } from './analysis.js';
import { audit } from './audit.js';
import { notify } from './notifications.js';

/**
 * Review comments: threads on the analysis as a whole or anchored to one table row or chart; one
 * level of replies (a reply to a reply joins the same thread); a thread is resolved as a whole.
 */

type CommentRow = typeof comments.$inferSelect;

function toItems(db: Db, rows: CommentRow[]): CommentItem[] {
  const ids = [...new Set(rows.flatMap((r) => [r.userId, ...(r.resolvedBy === null ? [] : [r.resolvedBy])]))];
  const names = new Map(ids.length ? db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids)).all().map((u) => [u.id, u.name]) : []);
  const ref = (id: number) => ({ id, name: names.get(id) ?? `user ${id}` });
  return rows.map((r) => ({
    id: r.id,
    parentId: r.parentId,
    anchor: r.anchor,
    body: r.body,
    user: ref(r.userId),
    createdAt: r.createdAt,
    resolvedAt: r.resolvedAt,
    resolvedBy: r.resolvedBy === null ? null : ref(r.resolvedBy),
  }));
}

export function listThreads(db: Db, analysisId: number, anchor?: string): CommentThread[] {
  const rows = db.select().from(comments).where(eq(comments.analysisId, analysisId)).orderBy(asc(comments.createdAt), asc(comments.id)).all();
  const items = toItems(db, rows);
  const threads = items.filter((c) => c.parentId === null && (anchor === undefined || c.anchor === anchor)).map((c): CommentThread => ({ ...c, replies: [] }));
  const byId = new Map(threads.map((t) => [t.id, t]));
  for (const c of items) if (c.parentId !== null) byId.get(c.parentId)?.replies.push(c);
  return threads;
}

function topLevel(db: Db, analysisId: number, id: number, path: string): CommentRow {
  const row = db.select().from(comments).where(and(eq(comments.id, id), eq(comments.analysisId, analysisId))).get();
  if (!row) throw new HttpError(path === 'parentId' ? 400 : 404, `${path === 'parentId' ? 'parentId: ' : ''}comment ${id} is not a comment of analysis ${analysisId}`, path === 'parentId' ? { details: [{ path, message: 'Unknown comment' }] } : undefined);
  return row;
}

export function addComment(db: Db, actor: Actor, analysis: AnalysisRow, body: CommentBody): CommentItem {
  let parent: CommentRow | undefined;
  if (body.parentId !== undefined) {
    parent = topLevel(db, analysis.id, body.parentId, 'parentId');
    // A reply to a reply joins the thread of its parent, so threads stay one level deep.
    if (parent.parentId !== null) parent = topLevel(db, analysis.id, parent.parentId, 'parentId');
  }
  const anchor = parent?.anchor ?? body.anchor ?? 'analysis';
  const study = studyOfAnalysis(db, analysis.id);
  const row = db.transaction((tx) => {
    const inserted = tx.insert(comments).values({ analysisId: analysis.id, parentId: parent?.id ?? null, userId: actor.userId, anchor, body: body.body }).returning().get();
    if (parent?.resolvedAt) tx.update(comments).set({ resolvedAt: null, resolvedBy: null }).where(eq(comments.id, parent.id)).run();
    audit(tx, { ...by(actor), studyId: analysis.studyId, entity: 'comment', entityId: String(inserted.id), action: parent ? 'reply' : 'create', field: anchor, newValue: body.body });
    const link = `${analysisLink(analysis.studyId, analysis.id)}?thread=${parent?.id ?? inserted.id}`;
    if (parent) {
      const inThread = tx.select({ userId: comments.userId }).from(comments).where(eq(comments.parentId, parent.id)).all().map((c) => c.userId);
      notify(tx, [parent.userId, study.ownerId, ...inThread].filter((id) => id !== actor.userId), 'reply', `Reply on "${analysis.title}" (${anchor})`, link);
    } else {
      notify(tx, [study.ownerId, analysis.createdBy].filter((id) => id !== actor.userId), 'comment', `New comment on "${analysis.title}" (${anchor})`, link);
    }
    return inserted;
  });
  return toItems(db, [row])[0]!;
}

export function resolveThread(db: Db, actor: Actor, analysis: AnalysisRow, commentId: number, resolved: boolean): CommentThread {
  const row = db.select().from(comments).where(and(eq(comments.id, commentId), eq(comments.analysisId, analysis.id))).get();
  if (!row) throw notFound(`Comment ${commentId}`);
  if (row.parentId !== null) throw new HttpError(400, `Comment ${commentId} is a reply; resolve its thread (comment ${row.parentId}) instead`);
  if (Boolean(row.resolvedAt) !== resolved) {
    db.transaction((tx) => {
      tx.update(comments).set(resolved ? { resolvedAt: Date.now(), resolvedBy: actor.userId } : { resolvedAt: null, resolvedBy: null }).where(eq(comments.id, commentId)).run();
      audit(tx, { ...by(actor), studyId: analysis.studyId, entity: 'comment', entityId: String(commentId), action: resolved ? 'resolve' : 'reopen', field: row.anchor });
    });
  }
  return listThreads(db, analysis.id).find((t) => t.id === commentId)!;
}
