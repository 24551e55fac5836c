import { sql } from 'drizzle-orm';
import { index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';

// Timestamps are stored as integer milliseconds since the epoch (UTC): sortable, compact and
// unambiguous across time zones. JSON columns hold small structured values validated by the zod
// schemas in shared/ on the way in.
const now = sql`(cast(unixepoch('subsec') * 1000 as integer))`;
const createdAt = () => integer('created_at').notNull().default(now);

// ---------------------------------------------------------------- accounts and sign-in

export const users = sqliteTable('users', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  role: text('role', { enum: ['admin', 'engineer', 'statistician', 'supervisor'] }).notNull(),
  passwordHash: text('password_hash').notNull(),
  active: integer('active', { mode: 'boolean' }).notNull().default(true),
  createdAt: createdAt(),
  updatedAt: integer('updated_at').notNull().default(now),
});

export const sessions = sqliteTable(
  'sessions',
  {
    sid: text('sid').primaryKey(),
    userId: integer('user_id'),
    data: text('data').notNull(),
    expiresAt: integer('expires_at').notNull(),
  },
  (t) => [index('sessions_user_idx').on(t.userId), index('sessions_expiry_idx').on(t.expiresAt)],
);

/** Single-use, expiring tokens; only a SHA-256 of the token is stored. */
export const invitations = sqliteTable('invitations', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  email: text('email').notNull(),
  name: text('name'),
  role: text('role', { enum: ['admin', 'engineer', 'statistician', 'supervisor'] }).notNull(),
  tokenHash: text('token_hash').notNull().unique(),
  invitedBy: integer('invited_by').references(() => users.id),
  expiresAt: integer('expires_at').notNull(),
  acceptedAt: integer('accepted_at'),
  revokedAt: integer('revoked_at'),
  createdAt: createdAt(),
});

export const passwordResets = sqliteTable('password_resets', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  userId: integer('user_id').notNull().references(() => users.id),
  tokenHash: text('token_hash').notNull().unique(),
  expiresAt: integer('expires_at').notNull(),
  usedAt: integer('used_at'),
  createdAt: createdAt(),
});

/** Personal access tokens for scripts (FE batches). Only a SHA-256 of the secret is stored. */
export const apiTokens = sqliteTable('api_tokens', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  userId: integer('user_id').notNull().references(() => users.id),
  name: text('name').notNull(),
  prefix: text('prefix').notNull(),
  tokenHash: text('token_hash').notNull().unique(),
  scope: text('scope', { enum: ['read', 'write'] }).notNull(),
  expiresAt: integer('expires_at').notNull(),
  revokedAt: integer('revoked_at'),
  lastUsedAt: integer('last_used_at'),
  createdAt: createdAt(),
});

/** Messages received by the local fake SMTP server (development, demo and tests only). */
export const mailMessages = sqliteTable('mail_messages', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  sender: text('sender').notNull(),
  recipients: text('recipients').notNull(),
  subject: text('subject').notNull(),
  textBody: text('text_body').notNull(),
  htmlBody: text('html_body'),
  raw: text('raw').notNull(),
  receivedAt: integer('received_at').notNull().default(now),
});

export const notifications = sqliteTable(
  'notifications',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    userId: integer('user_id').notNull().references(() => users.id),
    kind: text('kind').notNull(),
    message: text('message').notNull(),
    link: text('link'),
    readAt: integer('read_at'),
    createdAt: createdAt(),
  },
  (t) => [index('notifications_user_idx').on(t.userId)],
);

// ---------------------------------------------------------------- studies and their set-up

export const STUDY_STATUSES = ['draft', 'planned', 'collecting', 'analysed', 'in_review', 'approved'] as const;

export const studies = sqliteTable('studies', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  title: text('title').notNull(),
  purpose: text('purpose').notNull().default(''),
  specimenFamily: text('specimen_family').notNull().default(''),
  materialDescription: text('material_description').notNull().default(''),
  materialGrade: text('material_grade').notNull().default(''),
  batch: text('batch').notNull().default(''),
  thicknessMm: real('thickness_mm'),
  orientationDeg: real('orientation_deg'),
  ownerId: integer('owner_id').notNull().references(() => users.id),
  status: text('status', { enum: STUDY_STATUSES }).notNull().default('draft'),
  version: integer('version').notNull().default(1),
  createdAt: createdAt(),
  updatedAt: integer('updated_at').notNull().default(now),
});

export const studyMembers = sqliteTable(
  'study_members',
  {
    studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    userId: integer('user_id').notNull().references(() => users.id),
    role: text('role', { enum: ['owner', 'contributor', 'reviewer', 'viewer'] }).notNull(),
    addedAt: integer('added_at').notNull().default(now),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.userId] })],
);

export const factors = sqliteTable(
  'factors',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    position: integer('position').notNull(),
    name: text('name').notNull(),
    symbol: text('symbol').notNull(),
    unit: text('unit').notNull().default(''),
    kind: text('kind', { enum: ['numeric', 'categorical'] }).notNull(),
    /** JSON: [{ value: string, label?: string }] in level order. */
    levels: text('levels', { mode: 'json' }).notNull().$type<{ value: string; label?: string }[]>(),
    /** Numeric factors can record the measured (as-machined) value per run beside the nominal one. */
    tracksMeasured: integer('tracks_measured', { mode: 'boolean' }).notNull().default(false),
  },
  (t) => [uniqueIndex('factors_study_symbol').on(t.studyId, t.symbol)],
);

export const responses = sqliteTable(
  'responses',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    position: integer('position').notNull(),
    name: text('name').notNull(),
    symbol: text('symbol').notNull(),
    unit: text('unit').notNull().default(''),
    decimals: integer('decimals').notNull().default(3),
    goal: text('goal', { enum: ['nominal', 'smaller', 'larger', 'scatter'] }).notNull(),
    target: real('target'),
    rangeMin: real('range_min'),
    rangeMax: real('range_max'),
    /** Set for responses the product derives (e.g. 'hill-h-from-angle'); null for measured ones. */
    derivation: text('derivation', { mode: 'json' }).$type<Record<string, unknown> | null>(),
  },
  (t) => [uniqueIndex('responses_study_symbol').on(t.studyId, t.symbol)],
);

export const outcomes = sqliteTable('outcomes', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
  position: integer('position').notNull(),
  label: text('label').notNull(),
  valid: integer('valid', { mode: 'boolean' }).notNull(),
});

// ---------------------------------------------------------------- plan and runs

export const plans = sqliteTable('plans', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
  /** JSON: the plan request (design kind, replicates, blocks, centre points, seed, generators, ...). */
  spec: text('spec', { mode: 'json' }).notNull().$type<Record<string, unknown>>(),
  /** JSON: what the engine said about it (run count, resolution, aliases, power). */
  summary: text('summary', { mode: 'json' }).notNull().$type<Record<string, unknown>>(),
  createdBy: integer('created_by').notNull().references(() => users.id),
  createdAt: createdAt(),
});

export const runs = sqliteTable(
  'runs',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    planId: integer('plan_id').references(() => plans.id),
    /** Human run id shown on the bench, e.g. "R007"; unique within a study. */
    code: text('code').notNull(),
    standardOrder: integer('standard_order').notNull(),
    runOrder: integer('run_order').notNull(),
    block: text('block').notNull().default('1'),
    centrePoint: integer('centre_point', { mode: 'boolean' }).notNull().default(false),
    /** JSON: { [factorSymbol]: level value as text }. */
    settings: text('settings', { mode: 'json' }).notNull().$type<Record<string, string>>(),
    outcomeId: integer('outcome_id').references(() => outcomes.id),
    outcomeReason: text('outcome_reason').notNull().default(''),
    operator: text('operator').notNull().default(''),
    testedOn: text('tested_on').notNull().default(''),
    notes: text('notes').notNull().default(''),
    removedAt: integer('removed_at'),
    removedReason: text('removed_reason'),
    version: integer('version').notNull().default(1),
    updatedAt: integer('updated_at').notNull().default(now),
  },
  (t) => [uniqueIndex('runs_study_code').on(t.studyId, t.code), index('runs_study_order').on(t.studyId, t.runOrder)],
);

/** Measured (as-machined) value of a numeric factor for one run, kept as typed text and as a number. */
export const runMeasurements = sqliteTable(
  'run_measurements',
  {
    runId: integer('run_id').notNull().references(() => runs.id, { onDelete: 'cascade' }),
    factorId: integer('factor_id').notNull().references(() => factors.id, { onDelete: 'cascade' }),
    text: text('text').notNull(),
    value: real('value').notNull(),
  },
  (t) => [primaryKey({ columns: [t.runId, t.factorId] })],
);

/** A response value of one run: the decimal text as entered (for the exact-decimal engine path) and the number. */
export const runValues = sqliteTable(
  'run_values',
  {
    runId: integer('run_id').notNull().references(() => runs.id, { onDelete: 'cascade' }),
    responseId: integer('response_id').notNull().references(() => responses.id, { onDelete: 'cascade' }),
    text: text('text').notNull(),
    value: real('value').notNull(),
    /** JSON provenance when the value was derived (calculator): file checksum, frames, method, parameters, version. */
    provenance: text('provenance', { mode: 'json' }).$type<Record<string, unknown> | null>(),
    updatedAt: integer('updated_at').notNull().default(now),
  },
  (t) => [primaryKey({ columns: [t.runId, t.responseId] }), index('run_values_response').on(t.responseId)],
);

export const attachments = sqliteTable(
  'attachments',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    runId: integer('run_id').references(() => runs.id),
    fileName: text('file_name').notNull(),
    mimeType: text('mime_type').notNull(),
    sizeBytes: integer('size_bytes').notNull(),
    sha256: text('sha256').notNull(),
    storedName: text('stored_name').notNull(),
    kind: text('kind').notNull().default('raw'),
    uploadedBy: integer('uploaded_by').notNull().references(() => users.id),
    createdAt: createdAt(),
    deletedAt: integer('deleted_at'),
    deletedReason: text('deleted_reason'),
  },
  (t) => [index('attachments_run').on(t.runId)],
);

/**
 * A per-study data revision for caches (run sheet, analysis preview). Kept up by SQL triggers
 * (drizzle/0002_study-revisions.sql) on every table a study's data lives in, so any write — route,
 * CLI, import, restore script — moves it on. No foreign key on purpose: the row outlives its study,
 * so a revision never goes back and a cache entry can never match again after a delete.
 */
export const studyRevisions = sqliteTable('study_revisions', {
  studyId: integer('study_id').primaryKey(),
  revision: integer('revision').notNull().default(1),
});

/** Uploaded import files waiting for commit: the parsed rows and the validation outcome. */
export const imports = sqliteTable('imports', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
  userId: integer('user_id').notNull().references(() => users.id),
  fileName: text('file_name').notNull(),
  sha256: text('sha256').notNull(),
  status: text('status', { enum: ['preview', 'committed', 'discarded'] }).notNull().default('preview'),
  mapping: text('mapping', { mode: 'json' }).$type<Record<string, unknown>>(),
  payload: text('payload', { mode: 'json' }).notNull().$type<Record<string, unknown>>(),
  rowCount: integer('row_count').notNull(),
  errorCount: integer('error_count').notNull(),
  createdAt: createdAt(),
  committedAt: integer('committed_at'),
});

/** Client-supplied idempotency keys for the bulk result push. */
export const idempotencyKeys = sqliteTable('idempotency_keys', {
  key: text('key').notNull(),
  studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
  userId: integer('user_id').notNull().references(() => users.id),
  requestHash: text('request_hash').notNull(),
  responseJson: text('response_json').notNull(),
  createdAt: createdAt(),
}, (t) => [primaryKey({ columns: [t.studyId, t.key] })]);

/** Append-only audit trail: who, when, what, old, new, why. */
export const auditEvents = sqliteTable(
  'audit_events',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    at: integer('at').notNull().default(now),
    userId: integer('user_id').references(() => users.id),
    tokenId: integer('token_id').references(() => apiTokens.id),
    studyId: integer('study_id').references(() => studies.id, { onDelete: 'cascade' }),
    runId: integer('run_id'),
    entity: text('entity').notNull(),
    entityId: text('entity_id'),
    action: text('action').notNull(),
    field: text('field'),
    oldValue: text('old_value'),
    newValue: text('new_value'),
    reason: text('reason'),
  },
  (t) => [index('audit_study_idx').on(t.studyId, t.at), index('audit_run_idx').on(t.runId)],
);

// ---------------------------------------------------------------- analyses, review, sign-off

export const analyses = sqliteTable('analyses', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
  title: text('title').notNull(),
  spec: text('spec', { mode: 'json' }).notNull().$type<Record<string, unknown>>(),
  result: text('result', { mode: 'json' }).notNull().$type<Record<string, unknown>>(),
  engineVersion: text('engine_version').notNull(),
  dataHash: text('data_hash').notNull(),
  /** JSON: the exact rows the result was computed from (frozen with the analysis). */
  dataSnapshot: text('data_snapshot', { mode: 'json' }).notNull().$type<Record<string, unknown>[]>(),
  status: text('status', { enum: ['draft', 'in_review', 'returned', 'approved'] }).notNull().default('draft'),
  createdBy: integer('created_by').notNull().references(() => users.id),
  createdAt: createdAt(),
  approvedBy: integer('approved_by').references(() => users.id),
  approvedAt: integer('approved_at'),
  returnedReason: text('returned_reason'),
});

export const reviewRequests = sqliteTable('review_requests', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  analysisId: integer('analysis_id').notNull().references(() => analyses.id, { onDelete: 'cascade' }),
  reviewerId: integer('reviewer_id').notNull().references(() => users.id),
  requestedBy: integer('requested_by').notNull().references(() => users.id),
  message: text('message').notNull().default(''),
  createdAt: createdAt(),
});

export const comments = sqliteTable('comments', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  analysisId: integer('analysis_id').notNull().references(() => analyses.id, { onDelete: 'cascade' }),
  parentId: integer('parent_id'),
  userId: integer('user_id').notNull().references(() => users.id),
  /** What the comment is about: 'analysis', 'anova:<source>', 'chart:<id>', ... */
  anchor: text('anchor').notNull().default('analysis'),
  body: text('body').notNull(),
  createdAt: createdAt(),
  resolvedAt: integer('resolved_at'),
  resolvedBy: integer('resolved_by').references(() => users.id),
});

export const recommendations = sqliteTable('recommendations', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  studyId: integer('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
  analysisId: integer('analysis_id').notNull().references(() => analyses.id),
  /** JSON: [{ factor, level, toleranceMinus, tolerancePlus, unit }]. */
  settings: text('settings', { mode: 'json' }).notNull().$type<Record<string, unknown>[]>(),
  rationale: text('rationale').notNull(),
  createdBy: integer('created_by').notNull().references(() => users.id),
  createdAt: createdAt(),
});
