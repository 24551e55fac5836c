import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listRoutes, type RouteInfo } from '../../server/auth/route-list.js';
import { CATALOGUE, toOpenApiPath } from '../../server/openapi/document.js';
import { routeKey } from '../../server/openapi/catalogue.js';
import { loginBody } from '../../shared/auth.js';
import { resultPushBody } from '../../shared/results.js';
import { tokenCreateBody } from '../../shared/tokens.js';
import { startTestApp, type TestApp } from './harness.js';

// The API reference must describe the router as it is. Structure checked against the OpenAPI 3.1.0
// specification (spec.openapis.org/oas/v3.1.0: paths use {name} templates; every templated segment
// has a required "in: path" parameter; components.securitySchemes types "http" / "apiKey").

interface OpenApiOperation {
  tags?: string[];
  summary?: string;
  parameters?: { name: string; in: string; required?: boolean }[];
  requestBody?: { content: Record<string, { schema: { $ref?: string; properties?: Record<string, unknown>; required?: string[] } }> };
  responses: Record<string, unknown>;
  security?: unknown[];
  'x-access'?: string;
}
interface OpenApiDoc {
  openapi: string;
  info: { title: string; version: string };
  paths: Record<string, Record<string, OpenApiOperation>>;
  components: { schemas: Record<string, { properties?: Record<string, unknown>; required?: string[] }>; securitySchemes: Record<string, { type: string }> };
}

let t: TestApp;
let doc: OpenApiDoc;
let routes: RouteInfo[];

beforeAll(async () => {
  t = await startTestApp();
  routes = listRoutes(t.api);
  const res = await request(t.app).get('/api/openapi.json');
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toContain('application/json');
  doc = res.body as OpenApiDoc;
});
afterAll(() => t.close());

const operation = (r: { method: string; path: string }) => doc.paths[toOpenApiPath(r.path)]?.[r.method.toLowerCase()];

describe('GET /api/openapi.json', () => {
  it('is an OpenAPI 3.1 document of this version, served without signing in', () => {
    expect(doc.openapi).toBe('3.1.0');
    expect(doc.info.version).toBe(t.ctx.version);
    expect(doc.components.securitySchemes['bearerToken']?.type).toBe('http');
    expect(doc.components.securitySchemes['session']?.type).toBe('apiKey');
  });

  it('lists every route of the router, with path parameters as {name}', () => {
    expect(routes.length).toBeGreaterThan(20);
    const missing = routes.filter((r) => !operation(r)).map((r) => `${r.method} ${r.path}`);
    // A route missing here needs an entry in server/openapi/catalogue-*.ts.
    expect(missing).toEqual([]);
    for (const r of routes) {
      const names = [...r.path.matchAll(/:(\w+)/g)].map((m) => m[1]);
      const params = (operation(r)!.parameters ?? []).filter((p) => p.in === 'path');
      expect(params.map((p) => p.name).sort(), `${r.method} ${r.path}`).toEqual([...names].sort());
      expect(params.every((p) => p.required === true)).toBe(true);
    }
    expect(Object.keys(doc.paths).some((p) => p.includes(':'))).toBe(false);
  });

  it('documents nothing that the router does not have', () => {
    const live = new Set(routes.map((r) => routeKey(r.method, r.path)));
    const documented = Object.entries(doc.paths).flatMap(([p, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${p}`));
    const liveOpenApi = new Set(routes.map((r) => `${r.method} ${toOpenApiPath(r.path)}`));
    expect(documented.filter((d) => !liveOpenApi.has(d))).toEqual([]);
    // Catalogue entries for routes that were renamed or removed are stale documentation.
    expect(CATALOGUE.filter((c) => !live.has(routeKey(c.method, c.path))).map((c) => `${c.method} ${c.path}`)).toEqual([]);
  });

  it('takes request bodies from the shared zod schemas', () => {
    const body = (method: string, path: string) => {
      const content = operation({ method, path })!.requestBody!.content['application/json']!.schema;
      return content.$ref ? doc.components.schemas[content.$ref.split('/').at(-1)!]! : content;
    };
    expect(Object.keys(body('POST', '/auth/login').properties ?? {}).sort()).toEqual(Object.keys(loginBody.shape).sort());
    const token = body('POST', '/tokens');
    expect(Object.keys(token.properties ?? {}).sort()).toEqual(Object.keys(tokenCreateBody.shape).sort());
    expect(token.required?.sort()).toEqual(['expiresInDays', 'name', 'scope']);
    expect(JSON.stringify(token)).toContain('"maximum":365');
    expect(resultPushBody).toBeDefined();
    expect(JSON.stringify(body('POST', '/studies/:id/results'))).toContain('idempotencyKey');
    const upload = operation({ method: 'POST', path: '/studies/:id/imports' })!.requestBody!.content['multipart/form-data'];
    expect(upload).toBeDefined();
  });

  it('says who may call each route, from the route\'s own policy', () => {
    for (const r of routes) {
      const o = operation(r)!;
      expect(o.tags?.length, `${r.method} ${r.path}`).toBe(1);
      expect(o.summary, `${r.method} ${r.path}`).toBeTruthy();
      if (r.policy?.kind === 'public') expect(o.security).toEqual([]);
      else expect(o.responses['401'], `${r.method} ${r.path}`).toBeDefined();
    }
    expect(operation({ method: 'PATCH', path: '/users/:id' })!['x-access']).toBe('signed in as admin (API token: write scope)');
    expect(operation({ method: 'GET', path: '/health' })!['x-access']).toBe('anyone');
  });
});
