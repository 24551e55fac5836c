import Papa from 'papaparse';
import type { AuditQuery } from '../../shared/runs.js';
import type { Db } from '../db/client.js';
import { HttpError } from '../http-error.js';
import { csvCell } from './exports.js';

export interface AuditEventOut {
  id: number;
  at: number;
  user: { id: number; name: string } | null;
  tokenId: number | null;
  entity: string;
  entityId: string | null;
  action: string;
  field: string | null;
  oldValue: string | null;
  newValue: string | null;
  reason: string | null;
  runId: number | null;
  runCode: string | null;
}

function instant(raw: string, name: 'from' | 'to'): number {
  const n = /^\d+$/.test(raw) ? Number(raw) : Date.parse(raw);
  if (!Number.isFinite(n)) throw new HttpError(400, `${name}: "${raw}" is neither an ISO date/time nor epoch milliseconds`, { details: [{ path: name, message: 'Not a date' }] });
  return n;
}

/** The study's audit trail, newest first, with the filters of the audit page (and the per-run history). */
export function listAudit(db: Db, studyId: number, q: Partial<AuditQuery>): { events: AuditEventOut[]; total: number } {
  const where = ['e.study_id = ?'];
  const args: (string | number)[] = [studyId];
  const add = (sql: string, v: string | number) => {
    where.push(sql);
    args.push(v);
  };
  if (q.runId) add('e.run_id = ?', q.runId);
  if (q.userId) add('e.user_id = ?', q.userId);
  if (q.entity) add('e.entity = ?', q.entity);
  if (q.action) add('e.action = ?', q.action);
  if (q.field) add('e.field = ?', q.field);
  if (q.from) add('e.at >= ?', instant(q.from, 'from'));
  // A bare date as "to" includes that whole day.
  if (q.to) add('e.at <= ?', instant(q.to, 'to') + (/^\d{4}-\d{2}-\d{2}$/.test(q.to) ? 86_400_000 - 1 : 0));
  const filter = where.join(' and ');
  const total = (db.$client.prepare(`select count(*) as n from audit_events e where ${filter}`).get(...args) as { n: number }).n;
  const rows = db.$client
    .prepare(
      `select e.id, e.at, e.user_id as userId, u.name as userName, e.token_id as tokenId, e.entity, e.entity_id as entityId, e.action,
         e.field, e.old_value as oldValue, e.new_value as newValue, e.reason, e.run_id as runId, r.code as runCode
       from audit_events e left join users u on u.id = e.user_id left join runs r on r.id = e.run_id
       where ${filter} order by e.at desc, e.id desc limit ? offset ?`,
    )
    .all(...args, q.limit ?? 200, q.offset ?? 0) as (Omit<AuditEventOut, 'user'> & { userId: number | null; userName: string | null })[];
  const events = rows.map(({ userId, userName, ...e }) => ({ ...e, user: userId === null ? null : { id: userId, name: userName ?? '' } }));
  return { events, total };
}

export function auditCsv(events: AuditEventOut[]): string {
  const fields = ['at (UTC)', 'user', 'entity', 'entity id', 'run', 'action', 'field', 'old value', 'new value', 'reason', 'via token'];
  const data = events.map((e) =>
    [new Date(e.at).toISOString(), e.user?.name ?? '', e.entity, e.entityId ?? '', e.runCode ?? '', e.action, e.field ?? '', e.oldValue ?? '', e.newValue ?? '', e.reason ?? '', e.tokenId ?? '']
      .map((v) => csvCell(String(v))),
  );
  return '\ufeff' + Papa.unparse({ fields, data }, { newline: '\r\n' });
}
