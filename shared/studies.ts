import { z } from 'zod';
import { STUDY_ROLES } from './roles.js';

/**
 * Studies, membership and study set-up (factors, responses, outcomes): the request bodies the API
 * validates and the Angular client's forms share. Messages say what to fix, because the server's 400
 * carries them to the user verbatim.
 */

export const STUDY_STATUSES = ['draft', 'planned', 'collecting', 'analysed', 'in_review', 'approved'] as const;
export type StudyStatus = (typeof STUDY_STATUSES)[number];

export const STATUS_LABELS: Record<StudyStatus, string> = {
  draft: 'Draft',
  planned: 'Planned',
  collecting: 'Collecting',
  analysed: 'Analysed',
  in_review: 'In review',
  approved: 'Approved',
};

/**
 * Allowed status changes through PATCH /api/studies/:id. Forward steps follow the workflow; the
 * backward steps exist because real studies loop (more runs after a first analysis, a returned
 * review). `draft -> planned` happens by committing a plan and `in_review -> approved` by signing off
 * an analysis, so PATCH refuses both with a pointer to the right action.
 */
export const STATUS_TRANSITIONS: Record<StudyStatus, readonly StudyStatus[]> = {
  draft: [],
  planned: ['draft', 'collecting'],
  collecting: ['planned', 'analysed'],
  analysed: ['collecting', 'in_review'],
  in_review: ['analysed'],
  approved: ['collecting'],
};
/** Transitions that go back a step need a reason in the audit trail. */
export const BACKWARD_TRANSITIONS: readonly string[] = ['planned>draft', 'collecting>planned', 'analysed>collecting', 'in_review>analysed', 'approved>collecting'];

const text = (max: number, what: string) => z.string().trim().max(max, `${what}: use at most ${max} characters`);
const optionalNumber = (what: string, min: number, max: number) =>
  z
    .number({ message: `${what} must be a number` })
    .min(min, `${what} must be at least ${min}`)
    .max(max, `${what} must be at most ${max}`)
    .nullable();

export const studyFields = z.object({
  title: z.string({ message: 'Enter a title' }).trim().min(1, 'Enter a title').max(200, 'Title: use at most 200 characters'),
  purpose: text(4000, 'Purpose').default(''),
  specimenFamily: text(200, 'Specimen family').default(''),
  materialDescription: text(4000, 'Material description').default(''),
  materialGrade: text(120, 'Material grade').default(''),
  batch: text(120, 'Batch / heat / coil').default(''),
  thicknessMm: optionalNumber('Sheet thickness (mm)', 0.01, 100).default(null),
  orientationDeg: optionalNumber('Orientation to the rolling direction (deg)', 0, 180).default(null),
});

/** Admins create studies for an engineer (ownerId); engineers always own the studies they create. */
export const studyCreateBody = studyFields.extend({ ownerId: z.number().int().positive().optional() });
export type StudyCreateBody = z.infer<typeof studyCreateBody>;

export const studyPatchBody = studyFields
  .partial()
  .extend({
    status: z.enum(STUDY_STATUSES).optional(),
    /** Reason for the change; required for backward status steps. */
    reason: text(1000, 'Reason').optional(),
    /** The version the client last read; a stale one gets 409 with the current study. */
    version: z.number().int().positive().optional(),
  })
  .refine((v) => Object.keys(v).some((k) => k !== 'reason' && k !== 'version'), { message: 'Nothing to change: send at least one field' });
export type StudyPatchBody = z.infer<typeof studyPatchBody>;

export const studyListQuery = z.object({
  q: z.string().trim().max(200).optional(),
  status: z.enum(STUDY_STATUSES).optional(),
  ownerId: z.coerce.number().int().positive().optional(),
  sort: z.enum(['updated', 'created', 'title', 'status']).default('updated'),
  dir: z.enum(['asc', 'desc']).optional(),
});
export type StudyListQuery = z.infer<typeof studyListQuery>;

export const memberBody = z
  .object({
    userId: z.number().int().positive().optional(),
    email: z.string().trim().toLowerCase().max(254).optional(),
    role: z.enum(STUDY_ROLES, { message: `role must be one of ${STUDY_ROLES.join(', ')}` }),
  })
  .refine((v) => v.userId !== undefined || v.email !== undefined, { message: 'Name the member by userId or email', path: ['userId'] });
export type MemberBody = z.infer<typeof memberBody>;

export const memberDeleteQuery = z.object({ userId: z.coerce.number({ message: 'userId must be a number' }).int().positive() });

// ---------------------------------------------------------------- set-up

/** Short identifiers used as column keys (run sheet, imports, model terms). */
export const symbol = z
  .string({ message: 'Enter a symbol (e.g. w0 or H)' })
  .trim()
  .regex(/^[A-Za-z][A-Za-z0-9_]{0,23}$/, 'Symbol: start with a letter, then letters, digits or _ (at most 24)');

export const levelSchema = z.object({
  value: z.string().trim().min(1, 'Level value must not be empty').max(60, 'Level value: use at most 60 characters'),
  label: text(120, 'Level label').optional(),
});

export const factorSchema = z
  .object({
    id: z.number().int().positive().optional(),
    name: z.string({ message: 'Enter a factor name' }).trim().min(1, 'Enter a factor name').max(120),
    symbol,
    unit: text(40, 'Unit').default(''),
    kind: z.enum(['numeric', 'categorical'], { message: 'kind must be numeric or categorical' }),
    levels: z.array(levelSchema).min(2, 'A factor needs at least 2 levels').max(12, 'A factor can have at most 12 levels'),
    tracksMeasured: z.boolean().default(false),
  })
  .superRefine((f, ctx) => {
    const seen = new Set<string>();
    f.levels.forEach((l, i) => {
      if (seen.has(l.value)) ctx.addIssue({ code: 'custom', path: ['levels', i, 'value'], message: `Level "${l.value}" is listed twice` });
      seen.add(l.value);
      if (f.kind === 'numeric' && !DECIMAL_RE.test(l.value)) {
        ctx.addIssue({ code: 'custom', path: ['levels', i, 'value'], message: `Level "${l.value}" of a numeric factor must be a number (use a point as decimal mark)` });
      }
    });
    if (f.tracksMeasured && f.kind !== 'numeric') ctx.addIssue({ code: 'custom', path: ['tracksMeasured'], message: 'Only numeric factors have measured values' });
  });
export type FactorInput = z.infer<typeof factorSchema>;

const uniqueSymbols = <T extends { symbol: string }>(items: T[], ctx: z.RefinementCtx, key: string) => {
  const seen = new Set<string>();
  items.forEach((it, i) => {
    const lower = it.symbol.toLowerCase();
    if (seen.has(lower)) ctx.addIssue({ code: 'custom', path: [key, i, 'symbol'], message: `Symbol "${it.symbol}" is used twice` });
    seen.add(lower);
  });
};

export const factorsBody = z
  .object({ factors: z.array(factorSchema).max(10, 'At most 10 factors') })
  .superRefine((b, ctx) => uniqueSymbols(b.factors, ctx, 'factors'));
export type FactorsBody = z.infer<typeof factorsBody>;

export const RESPONSE_GOALS = ['nominal', 'smaller', 'larger', 'scatter'] as const;

export const responseSchema = z
  .object({
    id: z.number().int().positive().optional(),
    name: z.string({ message: 'Enter a response name' }).trim().min(1, 'Enter a response name').max(120),
    symbol,
    unit: text(40, 'Unit').default(''),
    decimals: z.number().int().min(0, 'Decimals: 0 to 10').max(10, 'Decimals: 0 to 10').default(3),
    goal: z.enum(RESPONSE_GOALS, { message: `goal must be one of ${RESPONSE_GOALS.join(', ')}` }),
    target: z.number().nullable().default(null),
    rangeMin: z.number().nullable().default(null),
    rangeMax: z.number().nullable().default(null),
  })
  .superRefine((r, ctx) => {
    if (r.goal === 'nominal' && r.target === null) ctx.addIssue({ code: 'custom', path: ['target'], message: 'A nominal-the-best response needs a target' });
    if (r.rangeMin !== null && r.rangeMax !== null && r.rangeMin >= r.rangeMax) {
      ctx.addIssue({ code: 'custom', path: ['rangeMax'], message: `Plausible range: the maximum (${r.rangeMax}) must be above the minimum (${r.rangeMin})` });
    }
  });
export type ResponseInput = z.infer<typeof responseSchema>;

export const responsesBody = z
  .object({ responses: z.array(responseSchema).max(20, 'At most 20 responses') })
  .superRefine((b, ctx) => uniqueSymbols(b.responses, ctx, 'responses'));
export type ResponsesBody = z.infer<typeof responsesBody>;

export const outcomeSchema = z.object({
  id: z.number().int().positive().optional(),
  label: z.string({ message: 'Enter an outcome label' }).trim().min(1, 'Enter an outcome label').max(120),
  /** Valid outcomes count in the analysis; invalid ones keep the run in the sheet but exclude it. */
  valid: z.boolean(),
});
export const outcomesBody = z
  .object({ outcomes: z.array(outcomeSchema).min(1, 'Keep at least one outcome').max(30) })
  .superRefine((b, ctx) => {
    const seen = new Set<string>();
    b.outcomes.forEach((o, i) => {
      if (seen.has(o.label.toLowerCase())) ctx.addIssue({ code: 'custom', path: ['outcomes', i, 'label'], message: `Outcome "${o.label}" is listed twice` });
      seen.add(o.label.toLowerCase());
    });
    if (!b.outcomes.some((o) => o.valid)) ctx.addIssue({ code: 'custom', path: ['outcomes'], message: 'At least one outcome must be valid' });
  });
export type OutcomesBody = z.infer<typeof outcomesBody>;

export const DEFAULT_OUTCOMES: { label: string; valid: boolean }[] = [
  { label: 'valid', valid: true },
  { label: 'brittle fracture', valid: false },
  { label: 'diffuse neck', valid: false },
  { label: 'no neck', valid: false },
  { label: 'fracture outside the gauge region', valid: false },
  { label: 'measurement lost', valid: false },
];

/**
 * A decimal number as typed: optional sign, digits with an optional point, optional exponent. A comma
 * decimal mark ("1,5") is refused rather than guessed, since "1,500" is ambiguous.
 */
export const DECIMAL_RE = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** An approved study's sign-off: which analysis, when, and whether the data it froze have changed since. */
export interface ApprovalState {
  analysisId: number;
  approvedAt: number;
  /** today's data under that analysis's selection no longer hash to what was approved */
  dataChanged: boolean;
}
