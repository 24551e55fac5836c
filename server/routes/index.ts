import type { Router } from 'express';
import type { AppContext } from '../context.js';
import { tokensRouter } from './tokens.js';

/**
 * Feature routers (studies, runs, analyses, tokens, ...) register here, each exporting
 * `(ctx) => Router` with full paths under /api. Keep one line per router.
 */
export function extraRouters(ctx: AppContext): Router[] {
  return [
    tokensRouter(ctx), // first: its token-use audit middleware must see every feature call
  ];
}
