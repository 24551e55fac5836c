import type { Request, Response } from 'express';
import Negotiator from 'negotiator';
import { brotliOf, gzippedOf, type CachedJson } from '../services/cached-json.js';

/** Below this, gzip costs more than it saves. */
const GZIP_MIN_BYTES = 1024;

/**
 * Sends a cached JSON response: for GET, an ETag and 304 when the client's If-None-Match names it;
 * Brotli or gzip when the client accepts it (Brotli on a tie: every current browser sends `br`).
 * `private, no-cache`: a browser may keep it but must revalidate every time (cheap: a 304), and no
 * shared cache may hand it to another user. The bytes go out with res.end: res.send would hash the
 * whole body for an ETag on every POST.
 */
export async function sendCachedJson(req: Request, res: Response, entry: CachedJson): Promise<void> {
  res.type('application/json');
  res.setHeader('Cache-Control', 'private, no-cache');
  res.vary('Accept-Encoding');
  // Validators only make sense for reads; a POST (the analysis preview) just gets the bytes.
  if (entry.etag && (req.method === 'GET' || req.method === 'HEAD')) {
    res.setHeader('ETag', entry.etag);
    const asked = req.headers['if-none-match'];
    if (asked && asked.split(',').some((t) => t.trim() === entry.etag || t.trim() === '*')) {
      res.status(304).end();
      return;
    }
  }
  const encoding = entry.json.length >= GZIP_MIN_BYTES ? bestEncoding(req) : 'identity';
  let body = entry.json;
  if (encoding === 'br' || encoding === 'gzip') {
    body = await (encoding === 'br' ? brotliOf(entry) : gzippedOf(entry));
    res.setHeader('Content-Encoding', encoding);
  }
  res.setHeader('Content-Length', body.length);
  if (req.method === 'HEAD') res.end();
  else res.end(body);
}

const OFFERED = ['br', 'gzip', 'identity'];

/**
 * The client's most wanted of br / gzip / identity. Browsers list gzip before br at equal q
 * ("gzip, deflate, br, zstd"), and express's acceptsEncodings breaks such ties by the client's order;
 * negotiator's `preferred` list breaks them by ours instead, so Brotli wins a tie.
 */
export function bestEncoding(req: Request): string {
  // negotiator 1.1 takes { preferred } (index.js); its @types still declare one parameter only
  const n = new Negotiator(req) as unknown as { encodings(available: string[], options: { preferred: string[] }): string[] };
  return n.encodings(OFFERED, { preferred: OFFERED })[0] ?? 'identity';
}
