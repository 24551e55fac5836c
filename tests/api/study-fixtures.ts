import { eq } from 'drizzle-orm';
import { runs, users } from '../../server/db/schema.js';
import type { Actor } from '../../server/services/actor.js';
import { createStudy } from '../../server/services/studies.js';
import { upsertMember } from '../../server/services/study-members.js';
import { putFactors, putResponses } from '../../server/services/study-setup.js';
import type { FactorsBody, ResponsesBody } from '../../shared/studies.js';
import type { Role } from '../../shared/roles.js';
import { DEMO_EMAIL, type TestApp } from './harness.js';

/**
 * Test studies built straight through the services (fast, and independent of the demo study):
 * factors A (numeric, 2 levels, measured tracked) and B (categorical, 3 levels), responses H (plausible
 * 0..2) and ang, and a full 2 x 3 layout with `replicates` runs per cell inserted as plain rows. The
 * rows are fixture data, not a design engine: settings in standard order, run order = standard order.
 */

export const FACTORS: FactorsBody = {
  factors: [
    { name: 'Neck width ratio', symbol: 'A', unit: '', kind: 'numeric', levels: [{ value: '0.5' }, { value: '0.8' }], tracksMeasured: true },
    { name: 'Notch shape', symbol: 'B', unit: '', kind: 'categorical', levels: [{ value: 'round' }, { value: 'vee' }, { value: 'flat' }], tracksMeasured: false },
  ],
};
export const RESPONSES: ResponsesBody = {
  responses: [
    { name: 'Hill H', symbol: 'H', unit: '', decimals: 3, goal: 'nominal', target: 0.5, rangeMin: 0, rangeMax: 2 },
    { name: 'Neck angle', symbol: 'ang', unit: 'deg', decimals: 1, goal: 'scatter', target: null, rangeMin: null, rangeMax: null },
  ],
};

export function userId(t: TestApp, role: Role): number {
  return t.ctx.db.select({ id: users.id }).from(users).where(eq(users.email, DEMO_EMAIL[role])).get()!.id;
}

export function actorFor(t: TestApp, role: Role): Actor {
  return { userId: userId(t, role), tokenId: null, role };
}

export interface TestStudy {
  id: number;
  runIds: number[];
}

export function makeStudy(t: TestApp, opts: { title?: string; replicates?: number; members?: boolean } = {}): TestStudy {
  const engineer = actorFor(t, 'engineer');
  const id = createStudy(t.ctx.db, engineer, { title: opts.title ?? 'Fixture study', purpose: '', specimenFamily: '', materialDescription: '', materialGrade: 'TEST-1', batch: '', thicknessMm: 1, orientationDeg: 0 });
  putFactors(t.ctx.db, engineer, id, FACTORS);
  putResponses(t.ctx.db, engineer, id, RESPONSES);
  if (opts.members !== false) {
    upsertMember(t.ctx.db, engineer, id, { userId: userId(t, 'statistician'), role: 'reviewer' });
    upsertMember(t.ctx.db, engineer, id, { userId: userId(t, 'supervisor'), role: 'viewer' });
  }
  const rows: (typeof runs.$inferInsert)[] = [];
  let order = 0;
  for (let rep = 0; rep < (opts.replicates ?? 2); rep++) {
    for (const b of FACTORS.factors[1]!.levels) {
      for (const a of FACTORS.factors[0]!.levels) {
        order++;
        rows.push({ studyId: id, code: `R${String(order).padStart(3, '0')}`, standardOrder: order, runOrder: order, block: '1', settings: { A: a.value, B: b.value } });
      }
    }
  }
  const runIds = t.ctx.db.insert(runs).values(rows).returning({ id: runs.id }).all().map((r) => r.id);
  return { id, runIds };
}
