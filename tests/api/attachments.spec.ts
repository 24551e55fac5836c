import { createHash } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachments } from '../../server/db/schema.js';
import { eq } from 'drizzle-orm';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { makeStudy } from './study-fixtures.js';

let t: TestApp;
let engineer: Client;
let supervisor: Client;

// A small upload limit (10 KiB) so the 413 case needs no large file.
beforeAll(async () => {
  t = await startTestApp({ MAX_UPLOAD_MB: String(10 / 1024) });
  engineer = await signIn(t.app, 'engineer');
  supervisor = await signIn(t.app, 'supervisor');
});
afterAll(() => t.close());

const uploadTo = (client: Client, studyId: number, runId: number) =>
  client.agent.post(`/api/studies/${studyId}/runs/${runId}/attachments`).set('X-XSRF-TOKEN', client.xsrf);


describe('attachments', () => {
  it('stores the file with its SHA-256 and gives back the same bytes', async () => {
    const { id, runIds } = makeStudy(t);
    const res = await uploadTo(engineer, id, runIds[0]!).field('kind', 'dic-export').attach('file', Buffer.from('abc'), 'strain-field.csv');
    expect(res.status).toBe(201);
    // FIPS 180-2, Appendix B.1: SHA-256("abc")
    expect(res.body.attachment).toMatchObject({ fileName: 'strain-field.csv', sizeBytes: 3, mimeType: 'text/csv', kind: 'dic-export', sha256: 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad' });
    const list = await supervisor.get(`/api/studies/${id}/runs/${runIds[0]}/attachments`);
    expect(list.body.attachments).toHaveLength(1);
    expect((await engineer.get(`/api/studies/${id}/runs`)).body.runs[0].attachmentCount).toBe(1);
    const dl = await supervisor.agent.get(`/api/studies/${id}/attachments/${res.body.attachment.id}/download`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(dl.status).toBe(200);
    expect(dl.headers['content-disposition']).toMatch(/^attachment; filename="?strain-field.csv"?$/);
    expect(dl.headers['x-checksum-sha256']).toBe(res.body.attachment.sha256);
    expect(createHash('sha256').update(dl.body as Buffer).digest('hex')).toBe(res.body.attachment.sha256);
    const audit = (await engineer.get(`/api/studies/${id}/audit?entity=attachment`)).body.events;
    expect(audit[0]).toMatchObject({ action: 'upload', runId: runIds[0] });
  });

  it('refuses types outside the list, files over the limit, missing files and viewers', async () => {
    const { id, runIds } = makeStudy(t);
    const exe = await uploadTo(engineer, id, runIds[0]!).attach('file', Buffer.from('MZ'), 'tool.exe');
    expect(exe.status).toBe(400);
    expect(exe.body.message).toMatch(/files of type "\.exe" are not accepted/);
    const big = await uploadTo(engineer, id, runIds[0]!).attach('file', Buffer.alloc(11 * 1024, 1), 'big.dat');
    expect(big.status).toBe(413);
    expect((await uploadTo(engineer, id, runIds[0]!).field('kind', 'raw')).status).toBe(400);
    expect((await uploadTo(engineer, id, runIds[0]!).field('kind', 'selfie').attach('file', Buffer.from('x'), 'a.png')).body.message).toMatch(/kind "selfie"/);
    expect((await uploadTo(supervisor, id, runIds[0]!).attach('file', Buffer.from('x'), 'a.txt')).status).toBe(403);
    expect((await uploadTo(engineer, id, 999999).attach('file', Buffer.from('x'), 'a.txt')).status).toBe(404);
    const leftovers = t.ctx.db.select().from(attachments).where(eq(attachments.studyId, id)).all();
    expect(leftovers).toEqual([]);
  });

  it('deletes only with a reason; the row stays, the bytes go', async () => {
    const { id, runIds } = makeStudy(t);
    const up = await uploadTo(engineer, id, runIds[1]!).attach('file', Buffer.from('photo'), 'neck.jpg');
    const attId = up.body.attachment.id as number;
    const stored = t.ctx.db.select().from(attachments).where(eq(attachments.id, attId)).get()!;
    const file = path.join(t.ctx.config.dataDir, 'attachments', stored.storedName);
    expect(existsSync(file)).toBe(true);
    expect((await engineer.delete(`/api/studies/${id}/attachments/${attId}`, {})).body.message).toMatch(/Say why the attachment is deleted/);
    expect((await supervisor.delete(`/api/studies/${id}/attachments/${attId}`, { reason: 'viewer tries' })).status).toBe(403);
    const del = await engineer.delete(`/api/studies/${id}/attachments/${attId}`, { reason: 'wrong specimen in the photo' });
    expect(del.status).toBe(200);
    expect(del.body.attachment).toMatchObject({ deletedReason: 'wrong specimen in the photo', sha256: up.body.attachment.sha256 });
    expect(existsSync(file)).toBe(false);
    expect((await engineer.get(`/api/studies/${id}/attachments/${attId}/download`)).status).toBe(410);
    const audit = (await engineer.get(`/api/studies/${id}/audit?entity=attachment&action=delete`)).body.events;
    expect(audit[0]).toMatchObject({ reason: 'wrong specimen in the photo', runId: runIds[1] });
  });
});
