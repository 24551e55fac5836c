import type { Router } from 'express';
import type { AppContext } from '../context.js';
import { attachmentsRouter } from './attachments.js';
import { auditRouter } from './audit.js';
import { exportsRouter } from './exports.js';
import { importsRouter } from './imports.js';
import { runsRouter } from './runs.js';
import { studiesRouter } from './studies.js';
import { tokensRouter } from './tokens.js';
import { resultsRouter } from './results.js';
import { calcRouter } from './calc.js';
import { analysesRouter } from './analyses.js';
import { reviewsRouter } from './reviews.js';
import { notificationsRouter } from './notifications.js';
import { operationsRouter } from '../ops/operations-router.js';
import { openapiRouter } from '../openapi/router.js';

/**
 * Feature routers (studies, runs, analyses, tokens, ...) register here, each exporting
 * `(ctx) => Router` with full paths under /api. Keep one line per router.
 */
export function extraRouters(ctx: AppContext): Router[] {
  return [
    tokensRouter(ctx), // first: its token-use audit middleware must see every feature call
    studiesRouter(ctx),
    runsRouter(ctx),
    importsRouter(ctx),
    exportsRouter(ctx),
    attachmentsRouter(ctx),
    auditRouter(ctx),
    resultsRouter(ctx),
    calcRouter(ctx),
    analysesRouter(ctx),
    reviewsRouter(ctx),
    notificationsRouter(ctx),
    operationsRouter(ctx),
    openapiRouter(ctx),
  ];
}
