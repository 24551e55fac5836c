import { z } from 'zod';

/** A client-chosen operation id (a UUID is the usual choice), sent as X-Operation-Id on the long request. */
export const OPERATION_ID_RE = /^[A-Za-z0-9_-]{8,64}$/;
export const OPERATION_HEADER = 'x-operation-id';

export const operationProgress = z
  .object({
    id: z.string(),
    kind: z.string(),
    state: z.enum(['running', 'done', 'failed']),
    phase: z.string(),
    done: z.number().int().nonnegative(),
    /** null while the size of the work is not known yet (e.g. still reading the file). */
    total: z.number().int().nonnegative().nullable(),
    /** 0–100, or null while total is unknown. */
    percent: z.number().min(0).max(100).nullable(),
    message: z.string().nullable(),
    startedAt: z.number().int(),
    updatedAt: z.number().int(),
  })
  .meta({ id: 'OperationProgress' });
export type OperationProgress = z.infer<typeof operationProgress>;
