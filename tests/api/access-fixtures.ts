import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { RouteInfo } from '../../server/auth/route-list.js';
import { addAttachment, attachmentDir } from '../../server/services/attachments.js';
import { createImport } from '../../server/services/imports.js';
import type { Role, StudyRole } from '../../shared/roles.js';
import type { TestApp } from './harness.js';
import { actorFor, makeStudy } from './study-fixtures.js';
import { insertWalkAnalysis } from './analysis-fixtures.js';

export type Expectation = 'allowed' | 'unauthenticated' | 'forbidden' | 'hidden';

export interface AccessFixtures {
  /** Values substituted for route parameters (:id, :runId, ...). */
  params: Record<string, string | number>;
  /** Routes exercised by their own tests instead (e.g. ones that need a multipart body). */
  skip: Set<string>;
  expect(route: RouteInfo, who: Role | 'anonymous'): Expectation;
}

/**
 * The study of the policy walk: engineer = owner, statistician = reviewer, supervisor = viewer, with
 * runs, an open import and an attachment so that every :param names something real. Admins pass every
 * study check; a non-member would get 404 (`hidden`; exercised in studies.spec.ts, since all three
 * non-admin demo accounts are members here).
 */
export const WALK_MEMBERSHIP: Partial<Record<Role, StudyRole>> = { engineer: 'owner', statistician: 'reviewer', supervisor: 'viewer' };

/** Routes only a supervisor reviewer may call, admins included in the refusal. */
const SIGN_OFF = new Set(['/analyses/:id/approve', '/analyses/:id/return']);

export async function accessFixtures(t: TestApp): Promise<AccessFixtures> {
  const study = makeStudy(t, { title: 'Access walk study' });
  const engineer = actorFor(t, 'engineer');
  const runId = study.runIds[0]!;
  const imp = createImport(t.ctx.db, engineer, study.id, { name: 'walk.csv', buffer: Buffer.from('run,H\nR001,0.5\n') }, { headers: ['run', 'H'], rows: [['R001', '0.5']] });
  const tmp = path.join(attachmentDir(t.ctx.config.dataDir), 'tmp');
  mkdirSync(tmp, { recursive: true });
  const file = path.join(tmp, 'walk-upload');
  writeFileSync(file, 'walk attachment\n');
  // `/analyses/:id` takes the same :id as the study routes: an analysis with the study's id (of the
  // walk study) lets one parameter value serve both route families.
  insertWalkAnalysis(t.ctx, study.id, engineer.userId, study.id);
  const att = await addAttachment(t.ctx.db, t.ctx.config.dataDir, engineer, study.id, runId, { path: file, originalname: 'walk.txt', size: 16 }, 'raw');
  return {
    params: { id: study.id, runId, importId: imp.id, attachmentId: att.id },
    skip: new Set(),
    expect(route, who) {
      const p = route.policy!;
      if (p.kind === 'public') return 'allowed';
      if (who === 'anonymous') return 'unauthenticated';
      if (p.kind === 'roles') return !p.roles || p.roles.includes(who) ? 'allowed' : 'forbidden';
      // Signing off is a supervisor's act: the analysis service refuses admins too (review.spec.ts).
      if (who === 'admin') return SIGN_OFF.has(route.path) ? 'forbidden' : 'allowed';
      const role = WALK_MEMBERSHIP[who];
      if (!role) return 'hidden';
      if (!p.studyRoles.includes(role)) return 'forbidden';
      return !p.roles || p.roles.includes(who) ? 'allowed' : 'forbidden';
    },
  };
}
