import type { Db } from '../db/client.js';
import { auditEvents } from '../db/schema.js';

/** A transaction handle or the database itself: audit rows are written inside the caller's transaction. */
export type DbOrTx = Pick<Db, 'insert' | 'select' | 'update' | 'delete'>;

export interface AuditEntry {
  userId?: number | null;
  tokenId?: number | null;
  studyId?: number | null;
  runId?: number | null;
  entity: string;
  entityId?: string | null;
  action: string;
  field?: string | null;
  oldValue?: string | null;
  newValue?: string | null;
  reason?: string | null;
}

/** Appends one audit row. Call it inside the same transaction as the change it records. */
export function audit(db: DbOrTx, entry: AuditEntry): void {
  db.insert(auditEvents).values(entry).run();
}

export function auditMany(db: DbOrTx, entries: AuditEntry[]): void {
  // SQLite caps bound parameters per statement; 11 columns x 80 rows stays well below 32766.
  for (let i = 0; i < entries.length; i += 80) db.insert(auditEvents).values(entries.slice(i, i + 80)).run();
}
