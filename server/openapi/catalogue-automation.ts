import { z } from 'zod';
import { operationProgress } from '../../shared/operations.js';
import { resultPushBody, resultPushResponse } from '../../shared/results.js';
import { op, type OperationDoc } from './catalogue.js';

/** Scripting: bulk result push, progress of long operations, this reference itself. */
export const AUTOMATION_OPERATIONS: OperationDoc[] = [
  op('POST /studies/:id/results', 'Automation', 'Push results from a script (bulk, idempotent, all-or-nothing)', {
    body: resultPushBody,
    headers: { 'Idempotency-Key': { description: 'A key you choose per push (8–200 of A-Z a-z 0-9 _ . : -). Or send the body as {idempotencyKey, results}.' } },
    response: resultPushResponse,
    description:
      'Each result finds its run by `runId` (numeric id or run code such as "R007") or by `settings` (every factor, replicates filled in run order). ' +
      'A retry with the same key and body returns the stored response (header Idempotent-Replayed: true) and changes nothing. ' +
      'Without `version`, a result may fill empty fields only; changing a recorded value needs the run\'s current version.',
    errors: { 409: 'A recorded value would be overwritten without version, or the version is stale (`current` holds the run)', 422: 'The key was already used with a different body' },
  }),
  op('GET /operations/:id', 'Automation', 'Progress of a long operation you started (import, report)', {
    response: z.object({ operation: operationProgress }),
    description: 'Send `X-Operation-Id: <your id>` with the long request, then poll this route with the same id.',
  }),
  op('GET /openapi.json', 'Automation', 'This API reference as an OpenAPI 3.1 document'),
];
