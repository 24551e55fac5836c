import { approveBody, commentBody, notificationsQuery, recommendationBody, resolveBody, returnBody, reviewRequestBody, saveAnalysisBody, analysisSpec } from '../../shared/analysis.js';
import { angleComputeBody, anglePushBody, angleStoreBody, derivedHPreviewBody, derivedHStoreBody, hFromAngleBody, hill48Body, neckAngleBody } from '../../shared/calc.js';
import { op, type OperationDoc } from './catalogue.js';

// Calculators, analyses, review and sign-off, notifications (issue 5 and the calculator issue).

const CAUTION = 'Results inform decisions; they do not replace qualified engineering judgement or the applicable test standards.';

export const ANALYSIS_OPERATIONS: OperationDoc[] = [
  op('POST /calc/hill48', 'Calculators', 'Hill 1948 parameters from r-values', { body: hill48Body, description: CAUTION }),
  op('POST /calc/neck-angle', 'Calculators', 'Neck angle from a measured displacement or strain field', { body: neckAngleBody }),
  op('POST /calc/h-from-angle', 'Calculators', 'Hill 1948 H from a measured neck angle', { body: hFromAngleBody, description: CAUTION }),
  op('GET /studies/:id/calc', 'Calculators', 'Calculator settings and derived responses of a study'),
  op('POST /studies/:id/runs/:runId/angle/files', 'Calculators', 'Upload a displacement history file for the angle calculator', {
    multipart: { file: { description: 'Image-correlation or FE export', binary: true, required: true } },
    status: 201,
    errors: { 413: 'The file is larger than the upload limit' },
  }),
  op('GET /studies/:id/runs/:runId/angle/files/:attachmentId', 'Calculators', 'A parsed history file of a run'),
  op('POST /studies/:id/runs/:runId/angle/compute', 'Calculators', 'Compute the neck angle of a run (nothing stored)', { body: angleComputeBody }),
  op('POST /studies/:id/runs/:runId/angle/store', 'Calculators', 'Store a computed angle with its provenance', { body: angleStoreBody, errors: { 409: 'The run changed meanwhile' } }),
  op('POST /studies/:id/runs/:runId/angle/push', 'Calculators', 'Compute and store the angle and the derived H in one step', { body: anglePushBody, errors: { 409: 'The run changed meanwhile' } }),
  op('POST /studies/:id/calc/derived-h/preview', 'Calculators', 'Preview derived H for every run (nothing stored)', { body: derivedHPreviewBody }),
  op('POST /studies/:id/calc/derived-h', 'Calculators', 'Store derived H for every run with provenance', { body: derivedHStoreBody }),

  op('POST /studies/:id/analyses/preview', 'Analyses', 'Run an analysis (ANOVA, checks, plots) without saving it', { body: analysisSpec, description: CAUTION }),
  op('POST /studies/:id/analyses', 'Analyses', 'Save an analysis with a frozen copy of its data', { body: saveAnalysisBody, status: 201 }),
  op('GET /studies/:id/analyses', 'Analyses', 'Saved analyses of a study'),
  op('GET /analyses/:id', 'Analyses', 'One saved analysis with its result and review state'),
  op('GET /analyses/:id/report.pdf', 'Analyses', 'The analysis report as PDF', { contentTypes: ['application/pdf'] }),
  op('GET /analyses/:id/report.html', 'Analyses', 'The analysis report as printable HTML', { contentTypes: ['text/html'] }),

  op('POST /analyses/:id/review-requests', 'Review', 'Ask a reviewer to review an analysis (owner)', { body: reviewRequestBody, status: 201 }),
  op('GET /analyses/:id/review-requests', 'Review', 'Review requests of an analysis'),
  op('POST /analyses/:id/comments', 'Review', 'Comment on an analysis or one of its parts', { body: commentBody, status: 201 }),
  op('GET /analyses/:id/comments', 'Review', 'Comment threads of an analysis'),
  op('POST /analyses/:id/comments/:commentId/resolve', 'Review', 'Resolve or reopen a comment thread', { body: resolveBody }),
  op('POST /analyses/:id/approve', 'Review', 'Sign off an analysis (reviewing supervisor)', { body: approveBody, errors: { 409: 'Not in review, or open comments remain' } }),
  op('POST /analyses/:id/return', 'Review', 'Return an analysis with a reason (reviewing supervisor)', { body: returnBody, errors: { 409: 'Not in review' } }),
  op('PUT /studies/:id/recommendation', 'Review', 'Record the recommended geometry with tolerances', { body: recommendationBody }),
  op('GET /studies/:id/recommendation', 'Review', 'The recorded recommendation'),

  op('GET /notifications', 'Notifications', 'Your notifications', { query: notificationsQuery }),
  op('POST /notifications/read-all', 'Notifications', 'Mark all your notifications read'),
  op('POST /notifications/:id/read', 'Notifications', 'Mark one notification read'),
];
