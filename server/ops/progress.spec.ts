import { describe, expect, it } from 'vitest';
import { HttpError } from '../http-error.js';
import { ProgressRegistry } from './progress.js';

// Progress bookkeeping: percent = done / total, rounded to 0.1 (common practice, no source).
describe('ProgressRegistry', () => {
  const owner = { id: 7, role: 'engineer' };

  it('reports phase, done, total and percent as the work proceeds, and 100 % when finished', () => {
    const reg = new ProgressRegistry();
    const op = reg.start(owner.id, 'import', 'client-id-0001');
    expect(reg.get('client-id-0001', owner)).toMatchObject({ state: 'running', phase: 'starting', done: 0, total: null, percent: null });
    op.update('validating', 1250, 5000);
    expect(reg.get(op.id, owner)).toMatchObject({ phase: 'validating', done: 1250, total: 5000, percent: 25 });
    op.update('validating', 1, 3);
    expect(reg.get(op.id, owner).percent).toBe(33.3);
    op.finish('5000 rows');
    expect(reg.get(op.id, owner)).toMatchObject({ state: 'done', done: 3, percent: 100, message: '5000 rows' });
  });

  it('records a failure with its message', () => {
    const reg = new ProgressRegistry();
    const op = reg.start(owner.id, 'report');
    op.fail('Row 12: "1,5" uses a comma');
    expect(reg.get(op.id, owner)).toMatchObject({ state: 'failed', message: 'Row 12: "1,5" uses a comma' });
  });

  it('shows an operation to its starter and admins only, and refuses bad or reused ids', () => {
    const reg = new ProgressRegistry();
    const op = reg.start(owner.id, 'import');
    expect(() => reg.get(op.id, { id: 8, role: 'engineer' })).toThrow(HttpError);
    expect(reg.get(op.id, { id: 1, role: 'admin' }).id).toBe(op.id);
    expect(() => reg.start(owner.id, 'import', 'bad id!')).toThrow(/"bad id!" is not valid/);
    reg.start(owner.id, 'import', 'reused-id-01');
    expect(() => reg.start(owner.id, 'import', 'reused-id-01')).toThrow(/already in use/);
  });

  it('checkpoint() hands the event loop over so other work (progress polls) runs during a long job', async () => {
    const reg = new ProgressRegistry();
    const op = reg.start(owner.id, 'import');
    let pollsAnswered = 0;
    const poller = setInterval(() => pollsAnswered++, 0);
    // A CPU-bound loop that would starve the timer without the checkpoints.
    const until = Date.now() + 300;
    let i = 0;
    while (Date.now() < until) await op.checkpoint('validating', ++i, null);
    clearInterval(poller);
    expect(pollsAnswered).toBeGreaterThan(0);
  });
});
