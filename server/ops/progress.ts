import { randomUUID } from 'node:crypto';
import type { Request } from 'express';
import { OPERATION_HEADER, OPERATION_ID_RE, type OperationProgress } from '../../shared/operations.js';
import type { AppContext } from '../context.js';
import { HttpError } from '../http-error.js';

/**
 * Progress of long operations (imports, report generation) for the client's progress bar.
 * In memory on purpose: progress is only meaningful while this process runs the work; nothing about
 * it needs to survive a restart. Finished entries are kept for KEEP_MS so a last poll sees the end.
 *
 * How a long request reports progress (see docs/automation.md):
 *   const op = startOperation(ctx, req, 'import');          // id from X-Operation-Id, else random
 *   op.update('parsing', 0, null);
 *   for (...) await op.checkpoint('validating', i, total);   // yields now and then so polls are served
 *   op.finish();                                              // or op.fail(message)
 * or `await withOperation(ctx, req, 'import', async (op) => { ... })`, which finishes or fails itself.
 * The client picks the id, sends it as X-Operation-Id with the long request and polls
 * GET /api/operations/:id meanwhile.
 */

const KEEP_MS = 10 * 60 * 1000;
/** Hand the event loop over at most this often, so progress polls get answered during CPU-bound work. */
const YIELD_EVERY_MS = 50;
const MAX_RUNNING_PER_USER = 20;

interface Entry extends OperationProgress {
  userId: number;
  finishedAt: number | null;
}

export interface OperationHandle {
  readonly id: string;
  update(phase: string, done: number, total: number | null): void;
  /** update() and, if YIELD_EVERY_MS has passed since the last yield, a turn of the event loop. */
  checkpoint(phase: string, done: number, total: number | null): Promise<void>;
  finish(message?: string): void;
  fail(message: string): void;
}

export class ProgressRegistry {
  private readonly entries = new Map<string, Entry>();

  start(userId: number, kind: string, requestedId?: string): OperationHandle {
    this.prune();
    if (requestedId !== undefined && !OPERATION_ID_RE.test(requestedId)) {
      throw new HttpError(400, `X-Operation-Id "${requestedId.slice(0, 80)}" is not valid: use 8–64 letters, digits, _ or - (a UUID works)`);
    }
    if (requestedId !== undefined && this.entries.has(requestedId)) throw new HttpError(409, `Operation id ${requestedId} is already in use; pick a new one`);
    const running = [...this.entries.values()].filter((e) => e.userId === userId && e.state === 'running').length;
    if (running >= MAX_RUNNING_PER_USER) throw new HttpError(429, `You already have ${running} long operations running; wait for one to finish`);
    const id = requestedId ?? randomUUID();
    const now = Date.now();
    const entry: Entry = { id, kind, state: 'running', phase: 'starting', done: 0, total: null, percent: null, message: null, startedAt: now, updatedAt: now, userId, finishedAt: null };
    this.entries.set(id, entry);
    let lastYield = now;
    const set = (patch: Partial<Entry>) => {
      Object.assign(entry, patch, { updatedAt: Date.now() });
      entry.percent = entry.total ? Math.min(100, Math.round((entry.done / entry.total) * 1000) / 10) : entry.state === 'done' ? 100 : null;
    };
    return {
      id,
      update: (phase, done, total) => set({ phase, done: Math.max(0, Math.floor(done)), total: total === null ? null : Math.max(0, Math.floor(total)) }),
      checkpoint: async (phase, done, total) => {
        set({ phase, done: Math.max(0, Math.floor(done)), total: total === null ? null : Math.max(0, Math.floor(total)) });
        if (Date.now() - lastYield >= YIELD_EVERY_MS) {
          await new Promise<void>((resolve) => setImmediate(resolve));
          lastYield = Date.now();
        }
      },
      finish: (message) => set({ state: 'done', phase: 'done', done: entry.total ?? entry.done, message: message ?? null, finishedAt: Date.now() }),
      fail: (message) => set({ state: 'failed', message, finishedAt: Date.now() }),
    };
  }

  /** Only the user who started an operation (or an admin) may watch it; others get 404. */
  get(id: string, viewer: { id: number; role: string }): OperationProgress {
    this.prune();
    const e = this.entries.get(id);
    if (!e || (e.userId !== viewer.id && viewer.role !== 'admin')) throw new HttpError(404, `Operation ${id} was not found (finished operations are kept for ${KEEP_MS / 60_000} minutes)`);
    const { userId: _u, finishedAt: _f, ...view } = e;
    return { ...view };
  }

  private prune(): void {
    const cutoff = Date.now() - KEEP_MS;
    for (const [id, e] of this.entries) if (e.finishedAt !== null && e.finishedAt < cutoff) this.entries.delete(id);
  }
}

const registries = new WeakMap<AppContext, ProgressRegistry>();

export function progressRegistry(ctx: AppContext): ProgressRegistry {
  let r = registries.get(ctx);
  if (!r) registries.set(ctx, (r = new ProgressRegistry()));
  return r;
}

/** Starts an operation for the request's user; the id comes from X-Operation-Id when the client sent one. */
export function startOperation(ctx: AppContext, req: Request, kind: string): OperationHandle {
  if (!req.user) throw new HttpError(401, 'Sign in to continue');
  const header = req.get(OPERATION_HEADER);
  const handle = progressRegistry(ctx).start(req.user.id, kind, header);
  req.res?.setHeader('X-Operation-Id', handle.id);
  return handle;
}

export async function withOperation<T>(ctx: AppContext, req: Request, kind: string, work: (op: OperationHandle) => Promise<T>): Promise<T> {
  const op = startOperation(ctx, req, kind);
  try {
    const result = await work(op);
    op.finish();
    return result;
  } catch (err) {
    // Any failure of the work is expected here: record it for the poller, then let it reach the error middleware.
    op.fail(err instanceof Error ? err.message : String(err));
    throw err;
  }
}
