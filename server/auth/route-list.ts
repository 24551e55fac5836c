import type { Router } from 'express';
import type { Policy } from './policy.js';

export interface RouteInfo {
  method: string;
  path: string;
  policy: Policy | undefined;
}

interface LayerLike {
  route?: { path: string; methods: Record<string, boolean>; stack: { handle: { policy?: Policy } }[] };
  handle?: { stack?: LayerLike[] };
}

/**
 * Lists every route of the API router with the policy declared by its first handler. Routers are
 * mounted without a prefix and routes use full paths, so `path` is the path under /api.
 */
export function listRoutes(router: Router): RouteInfo[] {
  const out: RouteInfo[] = [];
  const walk = (stack: LayerLike[]) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const method of Object.keys(layer.route.methods)) {
          if (method === '_all') continue;
          out.push({ method: method.toUpperCase(), path: layer.route.path, policy: layer.route.stack[0]?.handle.policy });
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack);
      }
    }
  };
  walk((router as unknown as { stack: LayerLike[] }).stack);
  return out;
}
