import type { Request, RequestHandler, Response } from 'express';
import { randomBytes } from 'node:crypto';
import { HttpError } from '../http-error.js';
import { safeEqual } from './secret-tokens.js';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
export const XSRF_COOKIE = 'XSRF-TOKEN';
export const XSRF_HEADER = 'x-xsrf-token';

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

/**
 * CSRF protection with Angular's cookie-to-header convention: the server keeps a random token in
 * the session and mirrors it in a readable XSRF-TOKEN cookie; Angular's HttpClient copies the cookie
 * into the X-XSRF-TOKEN header on mutating requests. A cross-site page can send the cookie but cannot
 * read it, so it cannot produce the header. Bearer-token calls carry no ambient credentials and are
 * exempt (the token itself is the proof).
 */
export const csrfProtection: RequestHandler = (req, res, next) => {
  if (req.authViaToken) return next();
  const session = req.session;
  if (!session.csrfToken) session.csrfToken = randomBytes(24).toString('base64url');
  if (req.cookies?.[XSRF_COOKIE] !== session.csrfToken) setXsrfCookie(req, res, session.csrfToken);
  if (SAFE_METHODS.has(req.method)) return next();
  const header = req.get(XSRF_HEADER);
  if (!header || !safeEqual(header, session.csrfToken)) {
    return next(new HttpError(403, 'The request is missing its security token (XSRF). Reload the page and try again.'));
  }
  next();
};

function setXsrfCookie(req: Request, res: Response, token: string): void {
  res.cookie(XSRF_COOKIE, token, { sameSite: 'lax', secure: req.secure, httpOnly: false, path: '/' });
}

/** After the session is regenerated (sign-in) the new session needs its own token, sent at once. */
export function renewCsrfToken(req: Request, res: Response): void {
  req.session.csrfToken = randomBytes(24).toString('base64url');
  setXsrfCookie(req, res, req.session.csrfToken);
}

/** Minimal cookie parsing: only the XSRF cookie is read, so a dependency is not worth it. */
export const parseCookies: RequestHandler = (req, _res, next) => {
  const out: Record<string, string> = {};
  for (const part of (req.headers.cookie ?? '').split(';')) {
    const i = part.indexOf('=');
    if (i < 0) continue;
    const key = part.slice(0, i).trim();
    try {
      out[key] = decodeURIComponent(part.slice(i + 1).trim());
    } catch {
      // A malformed percent-escape in some unrelated cookie: keep the raw text instead of failing.
      out[key] = part.slice(i + 1).trim();
    }
  }
  req.cookies = out;
  next();
};
