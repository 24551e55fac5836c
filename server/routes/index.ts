import type { Router } from 'express';
import type { AppContext } from '../context.js';

/**
 * Feature routers (studies, runs, analyses, tokens, ...) register here, each exporting
 * `(ctx) => Router` with full paths under /api. Keep one line per router.
 */
export function extraRouters(_ctx: AppContext): Router[] {
  return [];
}
