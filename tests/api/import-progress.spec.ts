import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { makeStudy } from './study-fixtures.js';

// Long operations report progress (issue 6): the client sends X-Operation-Id with the import and
// polls GET /api/operations/:id. Expected states are the contract in docs/automation.md
// (common practice, no source).

let t: TestApp;
let engineer: Client;
let other: Client;
beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  other = await signIn(t.app, 'statistician');
});
afterAll(() => t.close());

describe('import progress', () => {
  it('upload and commit are tracked under the client-chosen operation id, visible to their owner only', async () => {
    const { id } = makeStudy(t);
    const csv = 'Run,H\nR001,0.850\nR002,0.61\n';
    const up = await engineer.agent
      .post(`/api/studies/${id}/imports`)
      .set('X-XSRF-TOKEN', engineer.xsrf)
      .set('X-Operation-Id', 'test-import-0001')
      .attach('file', Buffer.from(csv), 'bench.csv');
    expect(up.status).toBe(201);
    expect(up.headers['x-operation-id']).toBe('test-import-0001');
    const op = await engineer.get('/api/operations/test-import-0001');
    expect(op.status).toBe(200);
    expect(op.body.operation).toMatchObject({ kind: 'import', state: 'done' });
    expect((await other.get('/api/operations/test-import-0001')).status).toBe(404);

    const commit = await engineer.agent
      .post(`/api/studies/${id}/imports/${up.body.import.id}/commit`)
      .set('X-XSRF-TOKEN', engineer.xsrf)
      .set('X-Operation-Id', 'test-commit-0001');
    expect(commit.status).toBe(200);
    expect((await engineer.get('/api/operations/test-commit-0001')).body.operation).toMatchObject({ kind: 'import-commit', state: 'done' });
  });

  it('a failed import is recorded as failed with its message', async () => {
    const { id } = makeStudy(t);
    const up = await engineer.agent
      .post(`/api/studies/${id}/imports`)
      .set('X-XSRF-TOKEN', engineer.xsrf)
      .set('X-Operation-Id', 'test-import-0002')
      .attach('file', Buffer.from(''), 'empty.csv');
    expect(up.status).toBeGreaterThanOrEqual(400);
    const op = await engineer.get('/api/operations/test-import-0002');
    expect(op.body.operation.state).toBe('failed');
    expect(op.body.operation.message).toBe(up.body.message);
  });
});
