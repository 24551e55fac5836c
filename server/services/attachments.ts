import { createHash, randomUUID } from 'node:crypto';
import { createReadStream, existsSync, mkdirSync, renameSync, rmSync } from 'node:fs';
import path from 'node:path';
import { and, asc, eq } from 'drizzle-orm';
import type { Db } from '../db/client.js';
import { attachments, users } from '../db/schema.js';
import { conflict, HttpError, notFound } from '../http-error.js';
import { audit } from './audit.js';
import { by, type Actor } from './actor.js';
import { getRun } from './runs.js';

/**
 * Files per run: FE output, image-correlation exports, photos. Stored under DATA_DIR/attachments
 * with a random name (the user's file name never becomes a path), checksummed with SHA-256 so a
 * report can prove which file it used, and always downloaded as an attachment (never rendered
 * inline, so an uploaded HTML or SVG cannot run in the app's origin).
 */

/** Allowed types by extension; the MIME type is ours, not the browser's claim. */
export const ATTACHMENT_TYPES: Record<string, string> = {
  csv: 'text/csv', txt: 'text/plain', dat: 'text/plain', log: 'text/plain', out: 'text/plain', inp: 'text/plain', json: 'application/json', xml: 'application/xml',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', ods: 'application/vnd.oasis.opendocument.spreadsheet',
  pdf: 'application/pdf', png: 'image/png', jpg: 'image/jpeg', jpeg: 'image/jpeg', tif: 'image/tiff', tiff: 'image/tiff', bmp: 'image/bmp',
  zip: 'application/zip', h5: 'application/x-hdf5', hdf5: 'application/x-hdf5', mat: 'application/octet-stream', odb: 'application/octet-stream',
  frd: 'application/octet-stream', vtk: 'application/octet-stream', vtu: 'application/octet-stream',
};
export const ATTACHMENT_KINDS = ['fe-output', 'dic-export', 'photo', 'raw', 'other'] as const;

export function attachmentDir(dataDir: string): string {
  return path.join(dataDir, 'attachments');
}

export function checkAttachmentName(fileName: string): string {
  const ext = path.extname(fileName).slice(1).toLowerCase();
  const mime = ATTACHMENT_TYPES[ext];
  if (!mime) throw new HttpError(400, `"${fileName}": files of type ".${ext || '(none)'}" are not accepted; allowed: ${Object.keys(ATTACHMENT_TYPES).join(', ')}`);
  return mime;
}

function sha256File(file: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const hash = createHash('sha256');
    createReadStream(file).on('data', (chunk) => hash.update(chunk)).on('end', () => resolve(hash.digest('hex'))).on('error', reject);
  });
}

function listQuery(db: Db) {
  return db
    .select({
      id: attachments.id, runId: attachments.runId, fileName: attachments.fileName, mimeType: attachments.mimeType, sizeBytes: attachments.sizeBytes,
      sha256: attachments.sha256, kind: attachments.kind, uploadedById: users.id, uploadedByName: users.name, createdAt: attachments.createdAt,
      deletedAt: attachments.deletedAt, deletedReason: attachments.deletedReason,
    })
    .from(attachments)
    .innerJoin(users, eq(users.id, attachments.uploadedBy));
}

type ListRow = Awaited<ReturnType<ReturnType<typeof listQuery>['all']>>[number];
const shape = ({ uploadedById, uploadedByName, ...a }: ListRow) => ({ ...a, uploadedBy: { id: uploadedById, name: uploadedByName } });

export function listAttachments(db: Db, studyId: number, runId: number) {
  getRun(db, studyId, runId);
  return listQuery(db).where(and(eq(attachments.studyId, studyId), eq(attachments.runId, runId))).orderBy(asc(attachments.id)).all().map(shape);
}

function getAttachment(db: Db, studyId: number, id: number) {
  const row = listQuery(db).where(and(eq(attachments.studyId, studyId), eq(attachments.id, id))).get();
  if (!row) throw notFound(`Attachment ${id} of this study`);
  return shape(row);
}

export async function addAttachment(
  db: Db,
  dataDir: string,
  actor: Actor,
  studyId: number,
  runId: number,
  upload: { path: string; originalname: string; size: number },
  kind: string,
) {
  try {
    const run = getRun(db, studyId, runId);
    if (run.removedAt !== null) throw conflict(`Run ${run.code} was removed; restore it before attaching files`);
    const mimeType = checkAttachmentName(upload.originalname);
    if (upload.size === 0) throw new HttpError(400, `"${upload.originalname}" is empty (0 bytes); attach the file with its content`);
    if (!(ATTACHMENT_KINDS as readonly string[]).includes(kind)) throw new HttpError(400, `kind "${kind}" is not one of ${ATTACHMENT_KINDS.join(', ')}`, { details: [{ path: 'kind', message: 'Unknown kind' }] });
    const sha256 = await sha256File(upload.path);
    const storedName = path.join(String(studyId), `${randomUUID()}${path.extname(upload.originalname).toLowerCase()}`);
    const target = path.join(attachmentDir(dataDir), storedName);
    mkdirSync(path.dirname(target), { recursive: true });
    renameSync(upload.path, target);
    const id = db.transaction((tx) => {
      const row = tx
        .insert(attachments)
        .values({ studyId, runId, fileName: path.basename(upload.originalname).slice(0, 255), mimeType, sizeBytes: upload.size, sha256, storedName, kind, uploadedBy: actor.userId })
        .returning()
        .get();
      audit(tx, { ...by(actor), studyId, runId, entity: 'attachment', entityId: String(row.id), action: 'upload', newValue: `${row.fileName} (${upload.size} bytes, sha256 ${sha256})` });
      return row.id;
    });
    return getAttachment(db, studyId, id);
  } finally {
    // The temporary upload is either moved into place or must not linger.
    if (existsSync(upload.path)) rmSync(upload.path, { force: true });
  }
}

export function attachmentFile(db: Db, dataDir: string, studyId: number, id: number) {
  const row = db.select().from(attachments).where(and(eq(attachments.studyId, studyId), eq(attachments.id, id))).get();
  if (!row) throw notFound(`Attachment ${id} of this study`);
  if (row.deletedAt !== null) throw new HttpError(410, `Attachment "${row.fileName}" was deleted (${row.deletedReason})`);
  const file = path.join(attachmentDir(dataDir), row.storedName);
  if (!existsSync(file)) throw new HttpError(500, `The file of attachment ${id} is missing from the data folder`);
  return { file, row };
}

export function deleteAttachment(db: Db, dataDir: string, actor: Actor, studyId: number, id: number, reason: string) {
  const { file, row } = attachmentFile(db, dataDir, studyId, id);
  db.transaction((tx) => {
    tx.update(attachments).set({ deletedAt: Date.now(), deletedReason: reason }).where(eq(attachments.id, id)).run();
    audit(tx, { ...by(actor), studyId, runId: row.runId, entity: 'attachment', entityId: String(id), action: 'delete', oldValue: `${row.fileName} (sha256 ${row.sha256})`, newValue: null, reason });
  });
  // The row (name, size, checksum, who, why) stays for the audit trail; the bytes go.
  rmSync(file, { force: true });
  return getAttachment(db, studyId, id);
}
