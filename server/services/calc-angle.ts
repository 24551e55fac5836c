import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import type { AngleComputeBody, AngleFileInfo, AngleMethod, AngleProvenance, AnglePushBody, AngleResultDto, AngleStoreBody } from '../../shared/calc.js';
import { relativeDisplacementAngle } from '../calc/displacement-angle.js';
import { H_ESTIMATE_CAUTIONS } from '../calc/h-from-angle.js';
import type { Db } from '../db/client.js';
import { conflict, HttpError } from '../http-error.js';
import type { Actor } from './actor.js';
import { addAttachment, attachmentDir, attachmentFile } from './attachments.js';
import { historyRows, PUSHED_MAPPING, pushedRowsCsv, suggestHistoryMapping } from './calc-history.js';
import { calcRunSummaries, writeCalculatedValues } from './calc-values.js';
import { parseImportFile } from './import-parse.js';
import { getRun } from './runs.js';
import { loadSetup } from './study-setup.js';

/**
 * Per-run relative-displacement angle: the displacement history is kept as a run attachment (the
 * attachments service: SHA-256, audit row), parsed with the import reader, computed by
 * server/calc/displacement-angle.ts, and the chosen feature (early maximum or plateau mean) stored as
 * the run's response value with its provenance. The value is always recomputed on the server from the
 * stored file at store time; a client never sends the number itself.
 */

const HISTORY_EXTENSIONS = new Set(['.csv', '.txt', '.xlsx']);

export const ANGLE_CAUTIONS: readonly string[] = Object.freeze([
  'The angle assumes the sheet outside the neck moves rigidly, so the two points move apart by the jump across the neck; place them close to, and on either side of, the neck.',
  ...H_ESTIMATE_CAUTIONS,
]);

interface Upload {
  path: string;
  originalname: string;
  size: number;
}

/** Keep an uploaded history as a run attachment, after checking that it parses as a table. */
export async function uploadHistory(db: Db, dataDir: string, actor: Actor, studyId: number, runId: number, upload: Upload): Promise<AngleFileInfo> {
  const ext = path.extname(upload.originalname).toLowerCase();
  let table;
  try {
    if (!HISTORY_EXTENSIONS.has(ext)) {
      throw new HttpError(400, `"${upload.originalname}": a displacement history must be a CSV or XLSX file (.csv, .txt, .xlsx), not "${ext || '(no extension)'}"`);
    }
    getRun(db, studyId, runId);
    table = await parseImportFile(upload.originalname, '', readFileSync(upload.path));
  } catch (err) {
    // Expected for an unreadable or refused file (HttpError 400/404): the temporary upload must not linger.
    rmSync(upload.path, { force: true });
    throw err;
  }
  const att = await addAttachment(db, dataDir, actor, studyId, runId, upload, 'dic-export');
  return { attachmentId: att.id, fileName: att.fileName, sha256: att.sha256, headers: table.headers, rowCount: table.rows.length, suggestedMapping: suggestHistoryMapping(table.headers) };
}

/** Headers and suggested mapping of a history already attached to the run. */
export async function historyFileInfo(db: Db, dataDir: string, studyId: number, runId: number, attachmentId: number): Promise<AngleFileInfo> {
  const { row, table } = await readHistory(db, dataDir, studyId, runId, attachmentId);
  return { attachmentId: row.id, fileName: row.fileName, sha256: row.sha256, headers: table.headers, rowCount: table.rows.length, suggestedMapping: suggestHistoryMapping(table.headers) };
}

async function readHistory(db: Db, dataDir: string, studyId: number, runId: number, attachmentId: number) {
  const { file, row } = attachmentFile(db, dataDir, studyId, attachmentId);
  if (row.runId !== runId) throw new HttpError(400, `attachmentId: attachment ${attachmentId} belongs to another run, not run ${runId}`, { details: [{ path: 'attachmentId', message: 'Not a file of this run' }] });
  const table = await parseImportFile(row.fileName, row.mimeType, readFileSync(file));
  return { row, table };
}

/** Compute the angle curve, maximum and plateau from an attached history. */
export async function computeAngle(db: Db, dataDir: string, studyId: number, runId: number, body: AngleComputeBody): Promise<AngleResultDto> {
  getRun(db, studyId, runId);
  const { row, table } = await readHistory(db, dataDir, studyId, runId, body.attachmentId);
  const res = relativeDisplacementAngle(historyRows(table, body.mapping, row.fileName), body.parameters);
  const used = res.curve.filter((c) => c.status === 'used');
  return {
    calcVersion: res.calcVersion,
    file: { attachmentId: row.id, fileName: row.fileName, sha256: row.sha256 },
    mapping: body.mapping,
    units: body.units,
    parameters: res.parameters,
    signConvention: res.signConvention,
    relativeDisplacementDefinition: `${res.relativeDisplacementDefinition} (${body.units.length})`,
    // NaN does not survive JSON: a zero-length increment's angle travels as null.
    curve: res.curve.map((c) => ({ fromFrame: c.fromFrame, toFrame: c.toFrame, angleDeg: Number.isFinite(c.angleDeg) ? c.angleDeg : null, relativeDisplacement: c.relativeDisplacement, spansGap: c.spansGap, status: c.status })),
    maximum: res.maximum ? { angleDeg: res.maximum.angleDeg, fromFrame: res.maximum.fromFrame, toFrame: res.maximum.toFrame, relativeDisplacement: res.maximum.relativeDisplacement } : null,
    plateau: res.plateau ? { ...res.plateau } : null,
    framesUsed: { count: res.framesUsed.length, first: used[0]?.fromFrame ?? null, last: used.at(-1)?.toFrame ?? null },
    droppedRows: res.droppedRows.map((d) => ({ ...d, row: d.row + 1 })),
    gaps: [...res.gaps],
    reversedOrder: res.reversedOrder,
    warnings: [...res.warnings],
    cautions: [...ANGLE_CAUTIONS],
  };
}

function chosen(res: AngleResultDto, method: AngleMethod): { value: number; from: number; to: number } {
  if (method === 'max') {
    if (!res.maximum) throw new HttpError(400, `method: no early maximum was found (${res.warnings.join('; ') || 'no increment in use'})`, { details: [{ path: 'method', message: 'No maximum' }] });
    return { value: res.maximum.angleDeg, from: res.maximum.fromFrame, to: res.maximum.toFrame };
  }
  if (!res.plateau) {
    throw new HttpError(400, `method: no plateau of ${res.parameters.minPlateauIncrements} increments within ±${res.parameters.plateauHalfBandDeg}° after the maximum; widen the band, shorten the minimum length, or store the maximum`, {
      details: [{ path: 'method', message: 'No plateau' }],
    });
  }
  return { value: res.plateau.meanAngleDeg, from: res.plateau.startFrame, to: res.plateau.endFrame };
}

/** Compute and store the chosen feature as the run's response value, with provenance, through the audited path. */
export async function storeAngle(db: Db, dataDir: string, actor: Actor, studyId: number, runId: number, body: AngleStoreBody) {
  const setup = loadSetup(db, studyId);
  const response = setup.responses.find((r) => r.symbol === body.response);
  if (!response) throw new HttpError(400, `response: no response "${body.response}" in this study (responses: ${setup.responses.map((r) => r.symbol).join(', ')})`, { details: [{ path: 'response', message: 'Unknown response' }] });
  if (response.derivation) throw conflict(`Response "${response.symbol}" is derived (${String(response.derivation['kind'])}) and filled by its derivation; choose a measured response for the angle`);
  const res = await computeAngle(db, dataDir, studyId, runId, body);
  const pick = chosen(res, body.method);
  const provenance: AngleProvenance = {
    kind: 'relative-displacement-angle',
    calcVersion: res.calcVersion,
    attachmentId: res.file.attachmentId,
    fileName: res.file.fileName,
    sha256: res.file.sha256,
    method: body.method,
    exactValue: pick.value,
    mapping: res.mapping,
    units: res.units,
    parameters: res.parameters,
    framesUsed: res.framesUsed,
    featureFrames: { from: pick.from, to: pick.to },
    reversedOrder: res.reversedOrder,
    droppedRows: res.droppedRows.length,
    gaps: res.gaps.length,
    computedAt: Date.now(),
  };
  // At least 4 decimals whatever the display setting: a derived H downstream should not inherit a rounded angle.
  const text = pick.value.toFixed(Math.max(response.decimals, 4));
  const out = writeCalculatedValues(db, actor, studyId, [{ runId, version: body.version, symbol: response.symbol, text, provenance }], { source: 'calc-angle', reason: body.reason });
  const run = calcRunSummaries(db, studyId, undefined, [runId])[0]!;
  return { run, result: res, stored: { response: response.symbol, text, method: body.method, provenance }, changes: out.changes, warnings: out.warnings };
}

/** Scripts: rows as JSON → kept as a CSV attachment → computed → stored if asked. */
export async function pushAngle(db: Db, dataDir: string, actor: Actor, studyId: number, runId: number, body: AnglePushBody) {
  getRun(db, studyId, runId);
  const tmp = path.join(attachmentDir(dataDir), 'tmp', `push-${randomUUID()}`);
  const csv = pushedRowsCsv(body.rows);
  writeFileSync(tmp, csv);
  const file = await uploadHistory(db, dataDir, actor, studyId, runId, { path: tmp, originalname: body.fileName, size: Buffer.byteLength(csv) });
  const compute = { attachmentId: file.attachmentId, mapping: PUSHED_MAPPING, units: body.units, parameters: body.parameters };
  if (!body.store) return { file, result: await computeAngle(db, dataDir, studyId, runId, compute), stored: null };
  const out = await storeAngle(db, dataDir, actor, studyId, runId, { ...compute, ...body.store });
  return { file, ...out };
}
