import type Database from 'better-sqlite3';
import type { Db } from '../db/client.js';

/**
 * A small least-recently-used cache bounded by the bytes of what it holds (a Map keeps insertion
 * order: a hit is re-inserted at the end, eviction takes from the front). No package in the stack
 * provides one, and the job is a dozen lines.
 *
 * Entries are keyed by study id + data revision (+ the request variant), never by time: an entry
 * is never stale, only unreachable once the revision moves on, and then it ages out.
 */
export class ByteLru<V> {
  private readonly entries = new Map<string, { value: V; bytes: number }>();
  private used = 0;

  constructor(readonly maxBytes: number) {}

  get(key: string): V | undefined {
    const hit = this.entries.get(key);
    if (!hit) return undefined;
    this.entries.delete(key);
    this.entries.set(key, hit);
    return hit.value;
  }

  /** Stores `value`; one larger than the whole budget is not kept (it would evict everything). */
  set(key: string, value: V, bytes: number): void {
    this.delete(key);
    if (bytes > this.maxBytes) return;
    this.entries.set(key, { value, bytes });
    this.used += bytes;
    this.evict();
  }

  private evict(): void {
    for (const [k, e] of this.entries) {
      if (this.used <= this.maxBytes) return;
      this.entries.delete(k);
      this.used -= e.bytes;
    }
  }

  delete(key: string): void {
    const e = this.entries.get(key);
    if (!e) return;
    this.entries.delete(key);
    this.used -= e.bytes;
  }

  get size(): number {
    return this.entries.size;
  }

  get bytes(): number {
    return this.used;
  }
}

// One cache per open database (not per module): test files and tools may hold several databases
// in one process, where study 1 at revision 3 names different data in each.
const caches = new WeakMap<Database.Database, Map<string, ByteLru<unknown>>>();

/** The named cache of this database connection, created with `maxBytes` on first use. */
export function cacheOf<V>(db: Db, name: string, maxBytes: number): ByteLru<V> {
  let named = caches.get(db.$client);
  if (!named) {
    named = new Map();
    caches.set(db.$client, named);
  }
  let cache = named.get(name);
  if (!cache) {
    cache = new ByteLru<unknown>(maxBytes);
    named.set(name, cache);
  }
  return cache as ByteLru<V>;
}
