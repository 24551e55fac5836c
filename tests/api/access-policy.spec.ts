import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listRoutes, type RouteInfo } from '../../server/auth/route-list.js';
import { ROLES, type Role } from '../../shared/roles.js';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { accessFixtures, type AccessFixtures } from './access-fixtures.js';

// The access policy is the product's contract on who may do what (common practice: deny by default,
// every route declares its policy). This test walks the real router, so a new route without a policy
// or a policy that the code does not enforce fails here.

let t: TestApp;
let fx: AccessFixtures;
let routes: RouteInfo[];
const clients = new Map<Role | 'anonymous', Client>();

beforeAll(async () => {
  t = await startTestApp();
  routes = listRoutes(t.api);
  fx = await accessFixtures(t);
  clients.set('anonymous', new Client(t.app));
  for (const role of ROLES) clients.set(role, await signIn(t.app, role));
});
afterAll(() => t.close());

function concrete(path: string): string {
  return path.replace(/:(\w+)/g, (_m, name: string) => String(fx.params[name] ?? 1));
}

describe('access policy', () => {
  it('finds the routes of the app', () => {
    expect(routes.length).toBeGreaterThan(10);
    expect(routes.map((r) => `${r.method} ${r.path}`)).toContain('POST /auth/login');
  });

  it('every route declares a policy', () => {
    const missing = routes.filter((r) => !r.policy).map((r) => `${r.method} ${r.path}`);
    expect(missing).toEqual([]);
  });

  it('every route x {anonymous, 4 roles} is answered as its policy says', async () => {
    const failures: string[] = [];
    for (const route of routes) {
      if (fx.skip.has(`${route.method} ${route.path}`)) continue;
      for (const who of ['anonymous', ...ROLES] as const) {
        const client = clients.get(who)!;
        const res = await client.call(route.method.toLowerCase() as 'get', '/api' + concrete(route.path), route.method === 'GET' ? undefined : {});
        const expected = fx.expect(route, who);
        const got = res.status === 401 ? 'unauthenticated' : res.status === 403 && !/XSRF/.test(String(res.body?.message)) ? 'forbidden' : res.status === 404 && expected === 'hidden' ? 'hidden' : 'allowed';
        if (got !== expected) failures.push(`${route.method} ${route.path} as ${who}: expected ${expected}, got ${res.status} ${JSON.stringify(res.body).slice(0, 120)}`);
        if (route.path === '/auth/logout' && who !== 'anonymous') clients.set(who, await signIn(t.app, who));
      }
    }
    expect(failures).toEqual([]);
  });
});
