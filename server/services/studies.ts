import { and, eq } from 'drizzle-orm';
import {
  BACKWARD_TRANSITIONS,
  DEFAULT_OUTCOMES,
  STATUS_TRANSITIONS,
  type StudyCreateBody,
  type StudyListQuery,
  type StudyPatchBody,
  type StudyStatus,
} from '../../shared/studies.js';
import type { StudyRole } from '../../shared/roles.js';
import type { Db } from '../db/client.js';
import { outcomes, studies, studyMembers, users } from '../db/schema.js';
import { conflict, HttpError, notFound } from '../http-error.js';
import { approvalStates } from './approval-state.js';
import { audit, type DbOrTx } from './audit.js';
import { by, type Actor } from './actor.js';
import { listMembers } from './study-members.js';
import { loadSetup } from './study-setup.js';
import { currentPlan } from './plan.js';

type StudyRow = typeof studies.$inferSelect;
export type ViewerRole = StudyRole | 'admin';

export interface Progress {
  planned: number;
  recorded: number;
  invalid: number;
  removed: number;
}

const EDITABLE_FIELDS = ['title', 'purpose', 'specimenFamily', 'materialDescription', 'materialGrade', 'batch', 'thicknessMm', 'orientationDeg'] as const;

export function getStudyRow(db: DbOrTx, id: number): StudyRow {
  const row = db.select().from(studies).where(eq(studies.id, id)).get();
  if (!row) throw notFound('The study');
  return row;
}

/**
 * Progress per study in one grouped query: planned = runs not removed, recorded = of those, runs
 * with at least one response value, invalid = of those, runs whose outcome is marked not valid.
 */
export function progressOf(db: Db, studyIds: number[]): Map<number, Progress> {
  const out = new Map<number, Progress>();
  if (studyIds.length === 0) return out;
  const rows = db.$client
    .prepare(
      `select r.study_id as studyId,
         sum(case when r.removed_at is null then 1 else 0 end) as planned,
         sum(case when r.removed_at is null and exists (select 1 from run_values v where v.run_id = r.id) then 1 else 0 end) as recorded,
         sum(case when r.removed_at is null and o.valid = 0 then 1 else 0 end) as invalid,
         sum(case when r.removed_at is not null then 1 else 0 end) as removed
       from runs r left join outcomes o on o.id = r.outcome_id
       where r.study_id in (select value from json_each(?))
       group by r.study_id`,
    )
    .all(JSON.stringify(studyIds)) as ({ studyId: number } & Progress)[];
  for (const r of rows) out.set(r.studyId, { planned: r.planned, recorded: r.recorded, invalid: r.invalid, removed: r.removed });
  return out;
}

const SORT_SQL: Record<StudyListQuery['sort'], string> = {
  updated: 's.updated_at',
  created: 's.created_at',
  title: 's.title collate nocase',
  status: "case s.status when 'draft' then 0 when 'planned' then 1 when 'collecting' then 2 when 'analysed' then 3 when 'in_review' then 4 else 5 end",
};

export function listStudies(db: Db, viewer: { id: number; isAdmin: boolean }, q: StudyListQuery) {
  const where: string[] = [];
  const params: (string | number)[] = [viewer.id];
  if (!viewer.isAdmin) where.push('m.role is not null');
  if (q.status) {
    where.push('s.status = ?');
    params.push(q.status);
  }
  if (q.ownerId) {
    where.push('s.owner_id = ?');
    params.push(q.ownerId);
  }
  if (q.q) {
    // LIKE with an escape character so that "%" and "_" typed by the user match themselves.
    const pattern = '%' + q.q.replace(/[\\%_]/g, (c) => '\\' + c) + '%';
    where.push(`(s.title like ? escape '\\' or s.purpose like ? escape '\\' or s.material_grade like ? escape '\\' or s.batch like ? escape '\\' or s.specimen_family like ? escape '\\')`);
    params.push(pattern, pattern, pattern, pattern, pattern);
  }
  const dir = q.dir ?? (q.sort === 'title' || q.sort === 'status' ? 'asc' : 'desc');
  const rows = db.$client
    .prepare(
      `select s.id, s.title, s.status, s.material_grade as materialGrade, s.batch, s.thickness_mm as thicknessMm,
         s.specimen_family as specimenFamily, s.created_at as createdAt, s.updated_at as updatedAt,
         u.id as ownerId, u.name as ownerName, m.role as memberRole
       from studies s join users u on u.id = s.owner_id
       left join study_members m on m.study_id = s.id and m.user_id = ?
       ${where.length ? 'where ' + where.join(' and ') : ''}
       order by ${SORT_SQL[q.sort]} ${dir === 'asc' ? 'asc' : 'desc'}, s.id desc`,
    )
    .all(...params) as {
    id: number; title: string; status: StudyStatus; materialGrade: string; batch: string; thicknessMm: number | null;
    specimenFamily: string; createdAt: number; updatedAt: number; ownerId: number; ownerName: string; memberRole: StudyRole | null;
  }[];
  const progress = progressOf(db, rows.map((r) => r.id));
  const approvals = approvalStates(db, rows.filter((r) => r.status === 'approved').map((r) => r.id));
  return rows.map(({ ownerId, ownerName, memberRole, ...r }) => ({
    ...r,
    owner: { id: ownerId, name: ownerName },
    myRole: (memberRole ?? 'admin') as ViewerRole,
    progress: progress.get(r.id) ?? { planned: 0, recorded: 0, invalid: 0, removed: 0 },
    approval: approvals.get(r.id) ?? null,
  }));
}

export function canEdit(role: ViewerRole): boolean {
  return role === 'owner' || role === 'contributor' || role === 'admin';
}

export function getStudyDetail(db: Db, id: number, viewerRole: ViewerRole) {
  const s = getStudyRow(db, id);
  const owner = db.select({ id: users.id, name: users.name }).from(users).where(eq(users.id, s.ownerId)).get()!;
  const setup = loadSetup(db, id);
  const allowed = canEdit(viewerRole) ? allowedTransitions(db, s) : [];
  return {
    ...s,
    owner,
    myRole: viewerRole,
    allowedTransitions: allowed,
    progress: progressOf(db, [id]).get(id) ?? { planned: 0, recorded: 0, invalid: 0, removed: 0 },
    approval: s.status === 'approved' ? (approvalStates(db, [id]).get(id) ?? null) : null,
    ...setup,
    members: listMembers(db, id),
    plan: currentPlan(db, id),
  };
}

/** Runs holding anything a person entered: values, measurements, outcome, notes, operator, date or files. */
export function runsWithResults(db: Db, studyId: number): number {
  const row = db.$client
    .prepare(
      `select count(*) as n from runs r where r.study_id = ? and (
         exists (select 1 from run_values v where v.run_id = r.id) or
         exists (select 1 from run_measurements m where m.run_id = r.id) or
         exists (select 1 from attachments a where a.run_id = r.id) or
         r.outcome_id is not null or r.notes <> '' or r.operator <> '' or r.tested_on <> '')`,
    )
    .get(studyId) as { n: number };
  return row.n;
}

function allowedTransitions(db: Db, s: StudyRow): StudyStatus[] {
  return STATUS_TRANSITIONS[s.status].filter((to) => !(s.status === 'planned' && to === 'draft' && runsWithResults(db, s.id) > 0));
}

export function createStudy(db: Db, actor: Actor, body: StudyCreateBody): number {
  const { ownerId: requestedOwner, ...fields } = body;
  const ownerId = actor.role === 'admin' ? requestedOwner : actor.userId;
  if (actor.role === 'admin' && !requestedOwner) {
    throw new HttpError(400, 'An administrator creates a study for an engineer: send ownerId', { details: [{ path: 'ownerId', message: 'Required for administrators' }] });
  }
  if (actor.role !== 'admin' && requestedOwner && requestedOwner !== actor.userId) {
    throw new HttpError(400, `ownerId ${requestedOwner}: you can only create studies you own`, { details: [{ path: 'ownerId', message: 'Leave out or use your own id' }] });
  }
  const owner = db.select().from(users).where(eq(users.id, ownerId!)).get();
  if (!owner || !owner.active) throw new HttpError(400, `ownerId ${ownerId}: no active account with that id`, { details: [{ path: 'ownerId', message: 'Unknown user' }] });
  if (owner.role !== 'engineer') {
    throw new HttpError(400, `${owner.name} is a ${owner.role}; the owner of a study must be an engineer`, { details: [{ path: 'ownerId', message: 'Must be an engineer' }] });
  }
  return db.transaction((tx) => {
    const study = tx.insert(studies).values({ ...fields, ownerId: owner.id }).returning().get();
    tx.insert(studyMembers).values({ studyId: study.id, userId: owner.id, role: 'owner' }).run();
    tx.insert(outcomes).values(DEFAULT_OUTCOMES.map((o, i) => ({ ...o, studyId: study.id, position: i }))).run();
    audit(tx, { ...by(actor), studyId: study.id, entity: 'study', entityId: String(study.id), action: 'create', newValue: JSON.stringify({ ...fields, ownerId: owner.id }) });
    return study.id;
  });
}

export function patchStudy(db: Db, actor: Actor, viewerRole: ViewerRole, id: number, body: StudyPatchBody): void {
  db.transaction((tx) => {
    const before = getStudyRow(tx, id);
    if (body.version !== undefined && body.version !== before.version) {
      throw conflict(`The study was changed by someone else (version ${before.version}, you sent ${body.version}); reload and try again`, getStudyDetail(db, id, viewerRole));
    }
    const set: Partial<typeof studies.$inferInsert> = {};
    for (const key of EDITABLE_FIELDS) {
      const value = body[key];
      if (value === undefined || value === before[key]) continue;
      (set as Record<string, unknown>)[key] = value;
      audit(tx, { ...by(actor), studyId: id, entity: 'study', entityId: String(id), action: 'update', field: key, oldValue: stringOrNull(before[key]), newValue: stringOrNull(value), reason: body.reason ?? null });
    }
    if (body.status && body.status !== before.status) {
      checkTransition(db, before, body.status, body.reason);
      set.status = body.status;
      audit(tx, { ...by(actor), studyId: id, entity: 'study', entityId: String(id), action: 'status', field: 'status', oldValue: before.status, newValue: body.status, reason: body.reason ?? null });
    }
    if (Object.keys(set).length === 0) return;
    tx.update(studies).set({ ...set, version: before.version + 1, updatedAt: Date.now() }).where(eq(studies.id, id)).run();
  });
}

function checkTransition(db: Db, s: StudyRow, to: StudyStatus, reason: string | undefined): void {
  if (s.status === 'draft' && to === 'planned') throw conflict('A study becomes "planned" by committing a plan (POST /api/studies/:id/plan), not by changing its status');
  if (to === 'approved') throw conflict('A study becomes "approved" when a supervisor signs off an analysis, not by changing its status');
  const allowed = STATUS_TRANSITIONS[s.status];
  if (!allowed.includes(to)) {
    throw conflict(`A study cannot go from "${s.status}" to "${to}"; from "${s.status}" it can go to ${allowed.length ? allowed.map((a) => `"${a}"`).join(' or ') : 'no other status by hand'}`);
  }
  if (s.status === 'planned' && to === 'draft') {
    const n = runsWithResults(db, s.id);
    if (n > 0) throw conflict(`The study cannot go back to draft: ${n} runs already hold results`);
  }
  if (BACKWARD_TRANSITIONS.includes(`${s.status}>${to}`) && !reason) {
    throw new HttpError(400, `Going back from "${s.status}" to "${to}" needs a reason`, { details: [{ path: 'reason', message: 'Say why the study goes back a step' }] });
  }
}

/** Status changes made by the system as a side effect (plan commit, first value); audited like manual ones. */
export function autoAdvance(tx: DbOrTx, actor: Actor, studyId: number, from: StudyStatus, to: StudyStatus, why: string): void {
  const res = tx.update(studies).set({ status: to, updatedAt: Date.now() }).where(and(eq(studies.id, studyId), eq(studies.status, from))).returning({ id: studies.id }).all();
  if (res.length) audit(tx, { ...by(actor), studyId, entity: 'study', entityId: String(studyId), action: 'status', field: 'status', oldValue: from, newValue: to, reason: why });
}

/** Bumps the study's version after changes to its set-up, so a stale study form gets its 409. */
export function touchStudy(tx: DbOrTx, studyId: number): void {
  const s = tx.select({ version: studies.version }).from(studies).where(eq(studies.id, studyId)).get();
  if (s) tx.update(studies).set({ version: s.version + 1, updatedAt: Date.now() }).where(eq(studies.id, studyId)).run();
}

/** Run edits only move updatedAt (the list sorts by it); they do not invalidate study forms. */
export function touchStudyTime(tx: DbOrTx, studyId: number): void {
  tx.update(studies).set({ updatedAt: Date.now() }).where(eq(studies.id, studyId)).run();
}

function stringOrNull(v: unknown): string | null {
  return v === null || v === undefined ? null : String(v);
}
