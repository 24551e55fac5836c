import type Database from 'better-sqlite3';

type Cell = string | number | null;

const COLUMNS = 'at, user_id, token_id, study_id, run_id, entity, entity_id, action, field, old_value, new_value, reason';
const PER_ROW = 12;
/** Rows per statement: 64 x 12 = 768 parameters, far below SQLite's limit of 32766. */
const ROWS_PER_INSERT = 64;

const insertSql = (rows: number) => `insert into audit_events (${COLUMNS}) values ${Array.from({ length: rows }, () => '(?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)').join(', ')}`;

/** One audit row, in the column order of `audit_events`. */
export interface AuditRow {
  at: number;
  userId: number | null;
  tokenId: number | null;
  studyId: number | null;
  runId: number | null;
  entity: string;
  entityId: string | null;
  action: string;
  field: string | null;
  oldValue: string | null;
  newValue: string | null;
  reason: string | null;
}

/**
 * Audit rows written in multi-row inserts through one prepared statement: still one row per changed
 * value, but a 50 000-row import makes 2 300 statement calls instead of 150 000. Use it inside the
 * transaction of the change it records, and `flush()` before the transaction ends (or before anything
 * else in it writes audit rows, so that ids keep the order of the events).
 */
export class AuditBatch {
  private readonly full: Database.Statement<Cell[]>;
  private readonly pending: Cell[] = [];

  constructor(private readonly db: Database.Database) {
    this.full = db.prepare<Cell[]>(insertSql(ROWS_PER_INSERT));
  }

  add(r: AuditRow): void {
    this.pending.push(r.at, r.userId, r.tokenId, r.studyId, r.runId, r.entity, r.entityId, r.action, r.field, r.oldValue, r.newValue, r.reason);
    if (this.pending.length === ROWS_PER_INSERT * PER_ROW) {
      this.full.run(...this.pending);
      this.pending.length = 0;
    }
  }

  flush(): void {
    if (this.pending.length === 0) return;
    this.db.prepare<Cell[]>(insertSql(this.pending.length / PER_ROW)).run(...this.pending);
    this.pending.length = 0;
  }
}
