import { z } from 'zod';

/**
 * Bulk result push from scripts (FE batch post-processing): POST /api/studies/:id/results.
 * Each item finds its run by `runId` (the numeric id or the run code shown on the sheet, e.g. "R007")
 * or by its factor `settings`; values travel as decimal text (numbers are accepted and turned into
 * their shortest text, so "0.850" should be sent as a string to keep the trailing zero).
 */

export const IDEMPOTENCY_KEY_RE = /^[A-Za-z0-9_.:-]{8,200}$/;
export const idempotencyKey = z
  .string()
  .regex(IDEMPOTENCY_KEY_RE, 'The idempotency key must be 8–200 characters of letters, digits and _ . : - (a UUID works)');

/** Decimal text, a finite JSON number, or null to clear. 1e309 parses to Infinity and is named as such. */
const valueText = z.union([z.string().max(64, 'A value has at most 64 characters'), z.number(), z.null()], {
  error: (issue) => `${typeof issue.input === 'string' ? JSON.stringify(issue.input) : String(issue.input)} is not a value: send decimal text such as "0.850", a finite number, or null`,
});

export const resultItem = z
  .object({
    runId: z.union([z.number().int().positive(), z.string().trim().min(1).max(40)]).optional(),
    settings: z.record(z.string(), z.union([z.string().max(64), z.number()])).optional(),
    values: z.record(z.string(), valueText).optional(),
    /** Label of one of the study's outcomes (case-insensitive), e.g. "valid"; null clears it. */
    outcome: z.string().trim().max(120).nullable().optional(),
    outcomeReason: z.string().trim().max(1000).optional(),
    notes: z.string().max(4000, 'Notes: use at most 4000 characters').optional(),
    operator: z.string().trim().max(120).optional(),
    testedOn: z.string().trim().regex(/^(\d{4}-\d{2}-\d{2})?$/, 'testedOn must be a date like 2026-03-14').optional(),
    /** The run version last read. Without it, a push may fill empty fields but not change recorded ones. */
    version: z.number().int().positive().optional(),
  })
  .strict()
  .refine((v) => (v.runId === undefined) !== (v.settings === undefined), { message: 'Give either runId or settings (exactly one) to find the run', path: ['runId'] })
  .meta({ id: 'ResultItem' });
export type ResultItem = z.infer<typeof resultItem>;

export const MAX_PUSH_ITEMS = 10_000;
export const resultItems = z.array(resultItem).min(1, 'Send at least one result').max(MAX_PUSH_ITEMS, `At most ${MAX_PUSH_ITEMS} results per push`);

export const resultPushObject = z.object({ idempotencyKey, results: resultItems, reason: z.string().trim().max(1000).optional() }).strict();

/** The body is either the bare array (key in the Idempotency-Key header) or an object carrying the key. */
export const resultPushBody = z.union([resultItems, resultPushObject]).meta({ id: 'ResultPush' });

/** Parses either form with the errors of that form (a union would only say "Invalid input"). */
export function parseResultPush(body: unknown): ResultPushBody {
  return Array.isArray(body) ? resultItems.parse(body) : resultPushObject.parse(body);
}
export type ResultPushBody = z.infer<typeof resultPushBody>;

export const resultPushResponse = z
  .object({
    studyId: z.number().int(),
    idempotencyKey: z.string(),
    results: z.array(z.object({ index: z.number().int(), runId: z.number().int(), code: z.string(), version: z.number().int(), changed: z.number().int() })),
    changed: z.object({ runs: z.number().int(), fields: z.number().int() }),
    warnings: z.array(z.string()),
  })
  .meta({ id: 'ResultPushResponse' });
export type ResultPushResponse = z.infer<typeof resultPushResponse>;
