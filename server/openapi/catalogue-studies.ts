import { attachmentDeleteBody, auditQuery, exportQuery, importMapping, planBody, runBatchBody, runPatchBody, runRemoveBody, runRestoreBody, runsQuery } from '../../shared/runs.js';
import { factorsBody, memberBody, memberDeleteQuery, outcomesBody, responsesBody, studyCreateBody, studyListQuery, studyPatchBody } from '../../shared/studies.js';
import { op, type OperationDoc } from './catalogue.js';

// Routes of issue 4 (contract: docs/api-studies.md). Response shapes are described there in full;
// the reference names the envelope and the statuses.

const STALE = 'The version you sent is stale; `current` holds what is stored now';

export const STUDY_OPERATIONS: OperationDoc[] = [
  op('GET /studies', 'Studies', 'Studies you are a member of (admins: all), with progress', { query: studyListQuery }),
  op('POST /studies', 'Studies', 'Create a study (engineers; admins for an engineer)', { body: studyCreateBody, status: 201 }),
  op('GET /studies/:id', 'Studies', 'One study with factors, responses, outcomes, members and plan'),
  op('PATCH /studies/:id', 'Studies', 'Change study fields or status', { body: studyPatchBody, errors: { 409: `Refused status transition, or ${STALE.toLowerCase()}` } }),
  op('GET /studies/:id/members', 'Members', 'Members and their study roles'),
  op('GET /studies/:id/member-candidates', 'Members', 'Active accounts that could be added'),
  op('POST /studies/:id/members', 'Members', 'Add a member or change a member\'s role (owner)', { body: memberBody, status: 201 }),
  op('DELETE /studies/:id/members', 'Members', 'Remove a member (owner)', { query: memberDeleteQuery }),

  op('PUT /studies/:id/factors', 'Set-up', 'Replace the factor list (levels fixed once runs exist)', { body: factorsBody, errors: { 409: 'The change would alter the design of existing runs' } }),
  op('PUT /studies/:id/responses', 'Set-up', 'Replace the response list', { body: responsesBody, errors: { 409: 'A response with values cannot be deleted' } }),
  op('GET /studies/:id/outcomes', 'Set-up', 'Validity outcomes of the study'),
  op('PUT /studies/:id/outcomes', 'Set-up', 'Replace the outcome list', { body: outcomesBody, errors: { 409: 'An outcome in use cannot be deleted' } }),

  op('GET /studies/:id/plan', 'Plan', 'The committed plan, if any'),
  op('POST /studies/:id/plan/preview', 'Plan', 'Preview a plan: run count, resolution, aliases, power (nothing written)', { body: planBody }),
  op('POST /studies/:id/plan', 'Plan', 'Commit a plan: its runs replace the study\'s runs', { body: planBody, status: 201, errors: { 409: 'Runs already hold results' } }),

  op('GET /studies/:id/runs', 'Run sheet', 'The run sheet: every run with settings, values, outcome and counts', { query: runsQuery }),
  op('POST /studies/:id/runs/batch', 'Run sheet', 'Several run edits in one transaction (paste, undo)', { body: runBatchBody, errors: { 409: STALE } }),
  op('PATCH /studies/:id/runs/:runId', 'Run sheet', 'Edit one run (optimistic concurrency on version)', { body: runPatchBody, errors: { 409: STALE } }),
  op('DELETE /studies/:id/runs/:runId', 'Run sheet', 'Remove a run (soft, with reason)', { body: runRemoveBody }),
  op('POST /studies/:id/runs/:runId/restore', 'Run sheet', 'Restore a removed run', { body: runRestoreBody }),
  op('GET /studies/:id/runs/:runId/history', 'Run sheet', 'Audit history of one run'),

  op('POST /studies/:id/imports', 'Import', 'Upload CSV or XLSX: parsed, mapped and checked; nothing is written yet', {
    multipart: {
      file: { description: 'CSV (UTF-8) or XLSX (first sheet)', binary: true, required: true },
      mapping: { description: 'Optional JSON text {"columns": {"header": "run" | "factor:SYM" | "response:SYM" | ...}}' },
    },
    status: 201,
    errors: { 413: 'The file is larger than the upload limit' },
  }),
  op('GET /studies/:id/imports/:importId', 'Import', 'An import preview with its row errors'),
  op('PUT /studies/:id/imports/:importId/mapping', 'Import', 'Change the column mapping and check again', { body: importMapping }),
  op('POST /studies/:id/imports/:importId/commit', 'Import', 'Write all rows in one transaction, or none', { errors: { 409: 'Errors remain, or already committed' } }),
  op('DELETE /studies/:id/imports/:importId', 'Import', 'Discard an import preview'),

  op('GET /studies/:id/export', 'Export', 'The run sheet as CSV, XLSX or a printable bench sheet', {
    query: exportQuery,
    contentTypes: ['text/csv', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', 'text/html'],
    description: 'Text cells starting with = + - @, tab or CR are prefixed with an apostrophe so spreadsheets do not run them as formulas.',
  }),

  op('POST /studies/:id/runs/:runId/attachments', 'Attachments', 'Attach a file to a run (checksummed)', {
    multipart: { file: { description: 'The file', binary: true, required: true }, kind: { description: 'fe-output, dic-export, photo, raw or other' } },
    status: 201,
    errors: { 413: 'The file is larger than the upload limit' },
  }),
  op('GET /studies/:id/runs/:runId/attachments', 'Attachments', 'Attachments of a run, deleted ones included'),
  op('GET /studies/:id/attachments/:attachmentId/download', 'Attachments', 'Download an attachment (X-Checksum-SHA256 header)', { contentTypes: ['application/octet-stream'] }),
  op('DELETE /studies/:id/attachments/:attachmentId', 'Attachments', 'Delete an attachment (file removed, record kept)', { body: attachmentDeleteBody }),

  op('GET /studies/:id/audit', 'Audit', 'The study\'s audit trail, filtered; JSON or CSV', { query: auditQuery, contentTypes: ['application/json', 'text/csv'] }),
];

