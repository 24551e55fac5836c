import type { Role } from '../../shared/roles.js';
import type { AppContext } from '../context.js';
import { seedDemoStudy } from './demo-study.js';
import { createUser, findUserByEmail } from './users.js';

export const DEMO_PASSWORD = 'specimetry-demo';

export const DEMO_ACCOUNTS: { email: string; name: string; role: Role }[] = [
  { email: 'admin@specimetry.test', name: 'Avery Admin', role: 'admin' },
  { email: 'engineer@specimetry.test', name: 'Elin Engineer', role: 'engineer' },
  { email: 'statistician@specimetry.test', name: 'Sami Statistician', role: 'statistician' },
  { email: 'supervisor@specimetry.test', name: 'Priya Supervisor', role: 'supervisor' },
];

/** Further demo content (studies, runs) registers here so the seed stays one call. */
export const demoSeeders: ((ctx: AppContext) => Promise<void> | void)[] = [seedDemoStudy];

/** Idempotent: creates the four demo accounts (and the demo content) only where missing. */
export async function seedDemo(ctx: AppContext): Promise<void> {
  for (const account of DEMO_ACCOUNTS) {
    if (!findUserByEmail(ctx, account.email)) await createUser(ctx, { ...account, password: DEMO_PASSWORD });
  }
  for (const seeder of demoSeeders) await seeder(ctx);
}
