import type { Request, Response } from 'express';
import { gzippedOf, type CachedJson } from '../services/cached-json.js';

/** Below this, gzip costs more than it saves. */
const GZIP_MIN_BYTES = 1024;

/**
 * Sends a cached JSON response: for GET, an ETag and 304 when the client's If-None-Match names it;
 * gzip when the client accepts it. `private, no-cache`: a browser may keep it but must revalidate every time
 * (cheap: a 304), and no shared cache may hand it to another user.
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
  if (entry.json.length >= GZIP_MIN_BYTES && req.acceptsEncodings('gzip', 'identity') === 'gzip') {
    const body = await gzippedOf(entry);
    res.setHeader('Content-Encoding', 'gzip');
    res.send(body);
    return;
  }
  res.send(entry.json);
}
