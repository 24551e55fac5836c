import { angleComputeBody, anglePushBody, angleStoreBody, derivedHPreviewBody, derivedHStoreBody, hFromAngleBody, hill48Body, neckAngleBody } from '../../shared/calc.js';
import { op, type OperationDoc } from '../openapi/catalogue.js';

// API reference entries for server/routes/calc.ts (issue 7). Kept beside the calculator services so
// the calculator's routes and their description change together; the document builder lists them
// with the other catalogues (server/openapi/document.ts: `...CALC_OPERATIONS`).

const INADMISSIBLE = 'Inadmissible input: the message names the value and the admissible range (e.g. an angle that admits no positive H)';
const STALE = 'The run version you sent is stale; `current` holds the run as stored now';

export const CALC_OPERATIONS: OperationDoc[] = [
  op('POST /calc/hill48', 'Calculator', 'Hill 1948: r0, r45, r90 ↔ F, G, H, N (G + H = 1), yield locus beside von Mises, free neck along RD', { body: hill48Body, errors: { 400: INADMISSIBLE } }),
  op('POST /calc/neck-angle', 'Calculator', 'Imposed neck angle → predicted relative-displacement angle', { body: neckAngleBody, errors: { 400: INADMISSIBLE } }),
  op('POST /calc/h-from-angle', 'Calculator', 'Measured relative-displacement angle → H (F, G, N given, or normal anisotropy)', { body: hFromAngleBody, errors: { 400: INADMISSIBLE } }),
  op('GET /studies/:id/calc', 'Calculator', 'Responses (with derivations), factors and runs with the provenance of calculated values'),
  op('POST /studies/:id/runs/:runId/angle/files', 'Calculator', 'Upload a two-point displacement history (kept as a run attachment)', {
    multipart: { file: { description: 'CSV or XLSX: a frame or time column and the in-plane displacements of both points', binary: true, required: true } },
    status: 201,
  }),
  op('GET /studies/:id/runs/:runId/angle/files/:attachmentId', 'Calculator', 'Headers and suggested column mapping of an attached history'),
  op('POST /studies/:id/runs/:runId/angle/compute', 'Calculator', 'Angle against relative displacement, early maximum and plateau (nothing stored)', { body: angleComputeBody, errors: { 400: INADMISSIBLE } }),
  op('POST /studies/:id/runs/:runId/angle/store', 'Calculator', 'Recompute and store the maximum or plateau as the run\'s response value, with provenance', { body: angleStoreBody, errors: { 400: INADMISSIBLE, 409: STALE } }),
  op('POST /studies/:id/runs/:runId/angle/push', 'Calculator', 'Scripts: push a history as JSON rows; kept as a CSV attachment, computed, stored if asked', { body: anglePushBody, status: 201, errors: { 409: STALE } }),
  op('POST /studies/:id/calc/derived-h/preview', 'Calculator', 'Estimated H per run from the study\'s angles (nothing stored)', { body: derivedHPreviewBody }),
  op('POST /studies/:id/calc/derived-h', 'Calculator', 'Store estimated H per run as a derived response (runs without a solution get none, with the reason)', {
    body: derivedHStoreBody,
    errors: { 409: 'The target symbol is a measured response' },
  }),
];
