import { Router, type Express } from 'express';
import type { AppContext } from '../context.js';
import { publicRoute } from '../auth/policy.js';
import { listRoutes } from '../auth/route-list.js';
import { buildOpenApiDocument } from './document.js';

/**
 * GET /api/openapi.json. The document is built on first request from the live router (reached via
 * req.app, since feature routers are created before the API router is complete) and then cached.
 */
export function openapiRouter(ctx: AppContext): Router {
  const r = Router();
  let cached: string | null = null;
  r.get('/openapi.json', publicRoute(), (req, res) => {
    if (cached === null) {
      const app = req.app as Express & { router: Router };
      const routes = listRoutes(app.router).filter((x) => x.policy !== undefined);
      cached = JSON.stringify(buildOpenApiDocument(routes, ctx.version));
    }
    res.type('application/json').send(cached);
  });
  return r;
}
