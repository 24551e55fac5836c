import { z } from 'zod';

/**
 * Plan, run sheet, import and audit request bodies shared by the API and the Angular client.
 * Values travel as decimal text exactly as typed ("0.850", "1e-3"); the server keeps that text and
 * the parsed number side by side.
 */

// ---------------------------------------------------------------- plan

export const plannedEffect = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('cohenF'), f: z.number().positive('Cohen\'s f must be > 0').max(10) }),
  z.object({
    kind: z.literal('difference'),
    delta: z.number().positive('The difference to detect must be > 0'),
    sigma: z.number().positive('The expected standard deviation must be > 0'),
  }),
]);

export const planBody = z
  .object({
    design: z.enum(['full', 'fractional'], { message: 'design must be full or fractional' }),
    replicates: z.number().int().min(1, 'At least 1 replicate').max(50, 'At most 50 replicates'),
    /** Blocks: none, one per replicate, or a count that divides the replicates. */
    blocks: z.union([z.literal('none'), z.literal('perReplicate'), z.number().int().min(1).max(50)]).default('none'),
    centrePoints: z.number().int().min(0).max(20, 'At most 20 centre points').default(0),
    seed: z.number().int().min(0).max(2 ** 31 - 1).default(1),
    randomise: z.boolean().default(true),
    /** 2^(k-p): p and, optionally, explicit generators such as "D=ABC"; without them the engine picks. */
    fraction: z
      .object({
        p: z.number().int().min(1).max(6),
        generators: z.array(z.string().trim().regex(/^[A-Za-z]\w*\s*=\s*-?[A-Za-z][\w*]*$/, 'A generator looks like D=ABC')).optional(),
      })
      .optional(),
    power: z
      .object({ effect: plannedEffect, alpha: z.number().gt(0).lt(1).default(0.05), targetPower: z.number().gt(0).lt(1).optional() })
      .optional(),
  })
  .superRefine((b, ctx) => {
    if (b.design === 'fractional' && !b.fraction) ctx.addIssue({ code: 'custom', path: ['fraction'], message: 'A fractional design needs fraction.p' });
    if (b.design === 'full' && b.fraction) ctx.addIssue({ code: 'custom', path: ['fraction'], message: 'fraction applies to design "fractional" only' });
    if (typeof b.blocks === 'number' && b.replicates % b.blocks !== 0) {
      ctx.addIssue({ code: 'custom', path: ['blocks'], message: `${b.blocks} blocks do not divide ${b.replicates} replicates` });
    }
  });
export type PlanBody = z.infer<typeof planBody>;

// ---------------------------------------------------------------- run edits

const cellText = z.string().max(64, 'A value has at most 64 characters').nullable();

/** The editable parts of a run. `null` or "" clears a value. */
export const runFields = z.object({
  values: z.record(z.string(), cellText).optional(),
  measured: z.record(z.string(), cellText).optional(),
  outcomeId: z.number().int().positive().nullable().optional(),
  outcomeReason: z.string().trim().max(1000).optional(),
  operator: z.string().trim().max(120).optional(),
  testedOn: z
    .string()
    .trim()
    .regex(/^(\d{4}-\d{2}-\d{2})?$/, 'testedOn must be a date like 2026-03-14')
    .optional(),
  notes: z.string().max(4000, 'Notes: use at most 4000 characters').optional(),
});
export type RunFields = z.infer<typeof runFields>;

/** PATCH /api/studies/:id/runs/:runId — version is the run's version as last read. */
export const runPatchBody = runFields.extend({
  version: z.number({ message: 'version is required (the run version you last read)' }).int().positive(),
  reason: z.string().trim().max(1000).optional(),
});
export type RunPatchBody = z.infer<typeof runPatchBody>;

export const runEdit = runPatchBody.extend({ runId: z.number().int().positive() });
export type RunEdit = z.infer<typeof runEdit>;

/** POST /api/studies/:id/runs/batch — all edits in one transaction, or none. */
export const runBatchBody = z.object({
  edits: z.array(runEdit).min(1, 'Send at least one edit').max(10_000, 'At most 10 000 edits per batch'),
  reason: z.string().trim().max(1000).optional(),
});
export type RunBatchBody = z.infer<typeof runBatchBody>;

export const runRemoveBody = z.object({
  reason: z.string({ message: 'Say why the run is removed' }).trim().min(3, 'Say why the run is removed (at least 3 characters)').max(1000),
  version: z.number().int().positive().optional(),
});
export const runRestoreBody = z.object({ reason: z.string({ message: 'Say why the run is restored' }).trim().min(3, 'Say why the run is restored').max(1000) });

export const runsQuery = z.object({
  includeRemoved: z.enum(['0', '1', 'true', 'false']).optional(),
  /** rows (default): `runs` is an array of run objects; columns: `runs` is one array per field (shared/run-sheet.ts RunColumns) */
  layout: z.enum(['rows', 'columns'], { message: 'layout must be rows or columns' }).optional(),
});

/** One change as reported back (for undo and the history view). */
export interface RunChange {
  runId: number;
  code: string;
  field: string;
  oldValue: string | null;
  newValue: string | null;
}

// ---------------------------------------------------------------- import

/**
 * Where an import column goes: the run id, a factor setting (to find the run), a measured factor
 * value, a response, or one of the run's text fields. Anything unmapped is ignored.
 */
export const importTarget = z.union([
  z.enum(['ignore', 'run', 'outcome', 'outcomeReason', 'operator', 'testedOn', 'notes']),
  z.string().regex(/^(factor|measured|response):[A-Za-z]\w*$/, 'A target is run, factor:SYM, measured:SYM, response:SYM, outcome, outcomeReason, operator, testedOn, notes or ignore'),
]);
export const importMapping = z.object({ columns: z.record(z.string(), importTarget) });
export type ImportMapping = z.infer<typeof importMapping>;

export const IMPORT_ERROR_KINDS = ['unknown-level', 'non-numeric', 'duplicate-run', 'unmatched-run', 'unknown-outcome', 'bad-field', 'missing-key'] as const;
export type ImportErrorKind = (typeof IMPORT_ERROR_KINDS)[number];
export interface ImportRowError {
  /** 1-based data row number (the header is row 0), as a spreadsheet user counts below the header. */
  row: number;
  column: string | null;
  kind: ImportErrorKind;
  message: string;
}

// ---------------------------------------------------------------- audit

export const auditQuery = z.object({
  runId: z.coerce.number().int().positive().optional(),
  userId: z.coerce.number().int().positive().optional(),
  entity: z.string().trim().max(40).optional(),
  action: z.string().trim().max(40).optional(),
  field: z.string().trim().max(80).optional(),
  /** ISO date/time or epoch milliseconds. */
  from: z.string().trim().max(40).optional(),
  to: z.string().trim().max(40).optional(),
  limit: z.coerce.number().int().min(1).max(5000).default(200),
  offset: z.coerce.number().int().min(0).default(0),
  format: z.enum(['json', 'csv']).default('json'),
});
export type AuditQuery = z.infer<typeof auditQuery>;

export const exportQuery = z.object({
  format: z.enum(['csv', 'xlsx', 'html'], { message: 'format must be csv, xlsx or html' }).default('csv'),
  includeRemoved: z.enum(['0', '1', 'true', 'false']).optional(),
});

export const attachmentDeleteBody = z.object({ reason: z.string({ message: 'Say why the attachment is deleted' }).trim().min(3, 'Say why the attachment is deleted (at least 3 characters)').max(1000) });
