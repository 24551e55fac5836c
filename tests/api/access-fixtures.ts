import type { RouteInfo } from '../../server/auth/route-list.js';
import type { Role } from '../../shared/roles.js';
import type { TestApp } from './harness.js';

export type Expectation = 'allowed' | 'unauthenticated' | 'forbidden' | 'hidden';

export interface AccessFixtures {
  /** Values substituted for route parameters (:id, :runId, ...). */
  params: Record<string, string | number>;
  /** Routes exercised by their own tests instead (e.g. ones that need a multipart body). */
  skip: Set<string>;
  expect(route: RouteInfo, who: Role | 'anonymous'): Expectation;
}

/**
 * Builds the data the policy walk needs and says what each caller should get. Study routes are
 * answered from the membership the fixture sets up (extended with the studies module).
 */
export async function accessFixtures(_t: TestApp): Promise<AccessFixtures> {
  return {
    params: { id: 1 },
    skip: new Set(),
    expect(route, who) {
      const p = route.policy!;
      if (p.kind === 'public') return 'allowed';
      if (who === 'anonymous') return 'unauthenticated';
      if (p.kind === 'roles') return !p.roles || p.roles.includes(who) ? 'allowed' : 'forbidden';
      // Study routes: admins pass; others depend on membership, filled in by the studies fixtures.
      return who === 'admin' ? 'allowed' : 'hidden';
    },
  };
}
