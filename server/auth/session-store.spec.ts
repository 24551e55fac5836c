import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { SessionData } from 'express-session';
import { openDatabase } from '../db/client.js';
import { DrizzleSessionStore, TOUCH_WRITE_INTERVAL_MS } from './session-store.js';

// The store's contract is express-session's Store interface (express-session README, "Session Store
// Implementation": get/set/destroy required, touch optional). The write throttle on touch is ours.

let dir: string;
let store: DrizzleSessionStore;
let rawExpiry: (sid: string) => number | undefined;
let close: () => void;

const cookieExpiring = (at: number) => ({ cookie: { expires: new Date(at), originalMaxAge: 1 } }) as unknown as SessionData;
const get = (sid: string) => new Promise<unknown>((resolve, reject) => store.get(sid, (err, data) => (err ? reject(err) : resolve(data))));

beforeEach(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'specimetry-session-'));
  const db = openDatabase(path.join(dir, 'test.sqlite'));
  store = new DrizzleSessionStore(db);
  rawExpiry = (sid) => (db.$client.prepare('select expires_at from sessions where sid = ?').pluck().get(sid) as number | undefined);
  close = () => db.$client.close();
});
afterEach(() => {
  close();
  rmSync(dir, { recursive: true, force: true });
});

describe('DrizzleSessionStore', () => {
  it('stores, reads back and destroys a session', async () => {
    const at = Date.now() + 3_600_000;
    store.set('s1', { ...cookieExpiring(at), passport: { user: 7 } } as SessionData);
    expect(await get('s1')).toMatchObject({ passport: { user: 7 } });
    expect(rawExpiry('s1')).toBe(at);
    store.destroy('s1');
    expect(await get('s1')).toBeNull();
  });

  it('treats an expired row as no session and removes it', async () => {
    store.set('old', cookieExpiring(Date.now() - 1000));
    expect(await get('old')).toBeNull();
    expect(rawExpiry('old')).toBeUndefined();
  });

  it('writes a touch only when the expiry moved by more than the interval', async () => {
    const at = Date.now() + 3_600_000;
    store.set('s2', cookieExpiring(at));
    store.touch('s2', cookieExpiring(at + TOUCH_WRITE_INTERVAL_MS - 1));
    expect(rawExpiry('s2')).toBe(at);
    store.touch('s2', cookieExpiring(at + TOUCH_WRITE_INTERVAL_MS + 1));
    expect(rawExpiry('s2')).toBe(at + TOUCH_WRITE_INTERVAL_MS + 1);
  });

  it('writes the first touch of a session it has not seen (e.g. after a restart)', async () => {
    const at = Date.now() + 3_600_000;
    store.set('s3', cookieExpiring(at));
    const other = new DrizzleSessionStore((store as unknown as { db: never }).db);
    other.touch('s3', cookieExpiring(at + 5));
    expect(rawExpiry('s3')).toBe(at + 5);
  });
});
