import { randomBytes } from 'node:crypto';
import { promisify } from 'node:util';
import { brotliCompress, constants as zlibConstants, gzip } from 'node:zlib';
import type { Db } from '../db/client.js';
import { cacheOf, type ByteLru } from './response-cache.js';
import { readAtRevision, studyRevision } from './study-revision.js';

const gzipAsync = promisify(gzip);
const brotliAsync = promisify(brotliCompress);

/**
 * A serialised JSON response kept for reuse: the bytes, and their gzip and Brotli forms made on first
 * demand (on libuv's thread pool, not the event loop: 5 MB take ~60 ms to gzip, ~80 ms at Brotli
 * quality 6).
 */
export interface CachedJson {
  /** Weak validator for GET responses; null when the study has no revision (nothing is cached then). */
  etag: string | null;
  json: Buffer;
  gzipped?: Promise<Buffer>;
  brotli?: Promise<Buffer>;
}

// Part of every ETag: after a restart (new code, or a restored database that reuses study ids and
// revisions) no validator a browser kept can match by accident.
const BOOT_ID = randomBytes(6).toString('base64url');

/**
 * The cached response of `build` for this study at its current data revision and this request
 * variant; built (inside one read snapshot with the revision) and stored on a miss.
 * The variant must name everything else the response depends on (query options, the spec, ...);
 * `build` must not depend on who asks — access is checked before, by the route's policy.
 */
export function cachedStudyJson(db: Db, cacheName: string, maxBytes: number, studyId: number, variant: string, build: () => unknown): CachedJson {
  const cache: ByteLru<CachedJson> = cacheOf<CachedJson>(db, cacheName, maxBytes);
  const keyAt = (revision: number) => `${studyId}:${revision}:${variant}`;
  const current = studyRevision(db, studyId);
  if (current !== null) {
    const hit = cache.get(keyAt(current));
    if (hit) return hit;
  }
  const { revision, value } = readAtRevision(db, studyId, build);
  const json = Buffer.from(JSON.stringify(value));
  if (revision === null) return { etag: null, json };
  const entry: CachedJson = { etag: `W/"${BOOT_ID}.${studyId}.${revision}.${Buffer.from(variant).toString('base64url')}"`, json };
  // the gzip form is counted at an eighth of the JSON until it exists (JSON of numbers packs ~8-10x)
  cache.set(keyAt(revision), entry, json.length + (json.length >> 3));
  return entry;
}

/** The gzip bytes of an entry, compressed once and shared by concurrent requests. */
export function gzippedOf(entry: CachedJson): Promise<Buffer> {
  if (!entry.gzipped) {
    entry.gzipped = gzipAsync(entry.json, { level: 6 });
    // a failed compression (not expected: in-memory input) is retried by the next request
    entry.gzipped.catch(() => (entry.gzipped = undefined));
  }
  return entry.gzipped;
}

/**
 * Brotli quality 6: a 10 000-run sheet (4.7 MB JSON) packs to ~36 % less than gzip level 6 in about
 * twice gzip's time; qualities 10-11 gain a further ~20 % but take seconds (measured 2026-12-02).
 */
const BROTLI_QUALITY = 6;

/** The Brotli bytes of an entry, compressed once and shared by concurrent requests. */
export function brotliOf(entry: CachedJson): Promise<Buffer> {
  if (!entry.brotli) {
    entry.brotli = brotliAsync(entry.json, {
      params: {
        [zlibConstants.BROTLI_PARAM_MODE]: zlibConstants.BROTLI_MODE_TEXT,
        [zlibConstants.BROTLI_PARAM_QUALITY]: BROTLI_QUALITY,
        [zlibConstants.BROTLI_PARAM_SIZE_HINT]: entry.json.length,
      },
    });
    entry.brotli.catch(() => (entry.brotli = undefined));
  }
  return entry.brotli;
}
