import { createHash } from 'node:crypto';
import type { AppContext } from '../../server/context.js';
import type { Actor } from '../../server/services/actor.js';
import { createStudy } from '../../server/services/studies.js';
import { putFactors, putResponses } from '../../server/services/study-setup.js';
import { factorsBody, responsesBody, type FactorInput } from '../../shared/studies.js';

/**
 * A study for the automation, hardening, concurrency and load tests and the benchmark: an invented
 * notched-strip scenario (neck width ratio W, notch angle A, ...) with a full factorial of runs. The
 * set-up goes through the studies services; the runs are inserted directly (one transaction) so a
 * 10 000-run study takes a second and the tests do not depend on the plan engine.
 */

export interface SeededStudy {
  studyId: number;
  ownerId: number;
  runs: { id: number; code: string; settings: Record<string, string> }[];
}

export const DEFAULT_FACTORS: FactorInput[] = [
  { name: 'Neck width ratio', symbol: 'W', unit: '', kind: 'numeric', levels: [{ value: '0.5' }, { value: '0.7' }], tracksMeasured: false },
  { name: 'Notch opening angle', symbol: 'A', unit: 'deg', kind: 'numeric', levels: [{ value: '30' }, { value: '45' }, { value: '60' }], tracksMeasured: false },
];

export const DEFAULT_RESPONSES = [
  { name: 'Anisotropy parameter H', symbol: 'H', unit: '', decimals: 3, goal: 'larger' as const, target: null, rangeMin: 0, rangeMax: 2 },
  { name: 'r-value', symbol: 'r', unit: '', decimals: 3, goal: 'larger' as const, target: null, rangeMin: 0, rangeMax: 5 },
];

function userId(ctx: AppContext, email: string): number {
  return (ctx.db.$client.prepare('select id from users where email = ?').get(email) as { id: number }).id;
}

export function seedStudy(
  ctx: AppContext,
  opts: { title?: string; factors?: FactorInput[]; replicates?: number; members?: { email: string; role: 'contributor' | 'reviewer' | 'viewer' }[] } = {},
): SeededStudy {
  const ownerId = userId(ctx, 'engineer@specimetry.test');
  const actor: Actor = { userId: ownerId, tokenId: null, role: 'engineer' };
  const studyId = createStudy(ctx.db, actor, { title: opts.title ?? 'Notched strip test study', purpose: '', specimenFamily: '', materialDescription: '', materialGrade: 'XS-420 (invented)', batch: 'B1', thicknessMm: 1.2, orientationDeg: 0 });
  const factors = opts.factors ?? DEFAULT_FACTORS;
  putFactors(ctx.db, actor, studyId, factorsBody.parse({ factors }));
  putResponses(ctx.db, actor, studyId, responsesBody.parse({ responses: DEFAULT_RESPONSES }));
  for (const m of opts.members ?? []) {
    ctx.db.$client.prepare('insert into study_members (study_id, user_id, role) values (?, ?, ?)').run(studyId, userId(ctx, m.email), m.role);
  }

  // Full factorial in standard order, replicated; run order shuffled deterministically.
  let combos: Record<string, string>[] = [{}];
  for (const f of factors) combos = combos.flatMap((c) => f.levels.map((l) => ({ ...c, [f.symbol]: l.value })));
  const settings: Record<string, string>[] = [];
  for (let r = 0; r < (opts.replicates ?? 2); r++) settings.push(...combos);
  const order = settings.map((_, i) => i).sort((a, b) => hash(a) - hash(b) || a - b);
  const width = Math.max(3, String(settings.length).length);
  const insert = ctx.db.$client.prepare('insert into runs (study_id, code, standard_order, run_order, block, settings) values (?, ?, ?, ?, ?, ?)');
  const runs: SeededStudy['runs'] = [];
  ctx.db.$client.transaction(() => {
    order.forEach((std, runOrder) => {
      const code = `R${String(runOrder + 1).padStart(width, '0')}`;
      const info = insert.run(studyId, code, std + 1, runOrder + 1, '1', JSON.stringify(settings[std]));
      runs.push({ id: Number(info.lastInsertRowid), code, settings: settings[std]! });
    });
  })();
  ctx.db.$client.prepare("update studies set status = 'planned' where id = ?").run(studyId);
  return { studyId, ownerId, runs };
}

function hash(i: number): number {
  return createHash('sha256').update(String(i)).digest().readUInt32BE(0);
}

/** A fingerprint of every run-related table of a study: equal before/after means nothing changed. */
export function studyFingerprint(ctx: AppContext, studyId: number): string {
  const c = ctx.db.$client;
  const parts = [
    c.prepare('select * from runs where study_id = ? order by id').all(studyId),
    c.prepare('select v.run_id, v.response_id, v.text, v.value from run_values v join runs r on r.id = v.run_id where r.study_id = ? order by 1, 2').all(studyId),
    c.prepare('select m.run_id, m.factor_id, m.text from run_measurements m join runs r on r.id = m.run_id where r.study_id = ? order by 1, 2').all(studyId),
    // Token-use rows (entity api-token) record refused calls too; they are not study data.
    c.prepare("select count(*) as n from audit_events where study_id = ? and entity != 'api-token'").get(studyId),
    c.prepare('select count(*) as n from attachments where study_id = ?').get(studyId),
    c.prepare('select id, status, version from studies where id = ?').get(studyId),
  ];
  return createHash('sha256').update(JSON.stringify(parts)).digest('hex');
}
