import { eq } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { studies } from '../db/schema.js';
import { mulberry32 } from '../stats/designs/prng.js';
import type { Actor } from './actor.js';
import { commitPlan } from './plan.js';
import { applyRunEdits, type EditInput } from './run-edits.js';
import { loadRuns } from './run-sheet.js';
import { createStudy } from './studies.js';
import { upsertMember } from './study-members.js';
import { loadSetup, putFactors, putResponses } from './study-setup.js';
import { findUserByEmail } from './users.js';

/**
 * The demo study. EVERYTHING HERE IS INVENTED: the lab ("Harwick Forming Lab"), the sheet material
 * ("AL-6K2", 1.2 mm), the operator and every value. No real material, test or publication is described.
 *
 * Design: notched strips, full factorial 3 x 3 x 2 with 3 replicates (54 runs), seed 2026:
 *   w   neck width ratio (neck width / strip width)  0.3, 0.5, 0.7   (measured width recorded)
 *   th  notch opening angle [deg]                   30, 60, 90
 *   rt  notch-root radius / sheet thickness          0.5, 1.0
 * With coded x1 = (w - 0.5)/0.2, x2 = (th - 60)/30, x3 = -1 for rt 0.5 and +1 for rt 1.0, values are
 *   H   = 0.520 + 0.060 x1 - 0.030 x2 + 0.010 x3 + 0.040 x1 x2 + e,  e ~ N(0, s_H),
 *         s_H = 0.016 for the sharp root (rt 0.5), 0.008 for rt 1.0   (scatter driven by rt)
 *   r   = 0.780 + 0.050 x1 + 0.020 x2 - 0.030 x1 x2 + e,  e ~ N(0, 0.020)
 *   psi = 58.0 - 4.0 x1 + 2.5 x2 + 1.5 x1 x2 + e [deg],  e ~ N(0, 1.2)
 * so w x th is a real two-factor interaction in all three responses, and rt moves the scatter of H
 * more than its mean. Noise: mulberry32(2026) with Box-Muller normals, so the data are identical on
 * every start. Four specimens are invalid with reasons (two keep their measured values).
 */

const TITLE = 'Notched strip geometry vs. Hill H — AL-6K2 1.2 mm (demo, invented data)';
const SEED = 2026;

function normal(random: () => number): () => number {
  return () => {
    // Box-Muller; 1 - u keeps the logarithm finite.
    const u = 1 - random();
    const v = random();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
}

export async function seedDemoStudy(ctx: AppContext): Promise<void> {
  const engineer = findUserByEmail(ctx, 'engineer@specimetry.test');
  const statistician = findUserByEmail(ctx, 'statistician@specimetry.test');
  const supervisor = findUserByEmail(ctx, 'supervisor@specimetry.test');
  if (!engineer || !statistician || !supervisor) return;
  if (ctx.db.select({ id: studies.id }).from(studies).where(eq(studies.title, TITLE)).get()) return;
  const db = ctx.db;
  const actor: Actor = { userId: engineer.id, tokenId: null, role: 'engineer' };
  const id = createStudy(db, actor, {
    title: TITLE,
    purpose: 'Demonstration study with invented data: which notch geometry gives a Hill H close to 0.55 with the least scatter, and does the neck width act differently at different notch angles?',
    specimenFamily: 'Notched strip, single-sided V notch',
    materialDescription: 'Invented aluminium alloy sheet AL-6K2 from the fictional Harwick Forming Lab; values generated from a stated model (see the seeder), not measured.',
    materialGrade: 'AL-6K2',
    batch: 'coil K2-0417 (fictional)',
    thicknessMm: 1.2,
    orientationDeg: 0,
  });
  upsertMember(db, actor, id, { userId: statistician.id, role: 'reviewer' });
  upsertMember(db, actor, id, { userId: supervisor.id, role: 'reviewer' });
  putFactors(db, actor, id, {
    factors: [
      { name: 'Neck width ratio', symbol: 'w', unit: '', kind: 'numeric', levels: [{ value: '0.3' }, { value: '0.5' }, { value: '0.7' }], tracksMeasured: true },
      { name: 'Notch opening angle', symbol: 'th', unit: 'deg', kind: 'numeric', levels: [{ value: '30' }, { value: '60' }, { value: '90' }], tracksMeasured: false },
      { name: 'Root radius / thickness', symbol: 'rt', unit: '', kind: 'numeric', levels: [{ value: '0.5', label: 'sharp' }, { value: '1.0', label: 'blunt' }], tracksMeasured: false },
    ],
  });
  putResponses(db, actor, id, {
    responses: [
      { name: 'Hill 1948 H', symbol: 'H', unit: '', decimals: 3, goal: 'nominal', target: 0.55, rangeMin: 0.2, rangeMax: 1.0 },
      { name: 'Apparent r-value', symbol: 'r', unit: '', decimals: 2, goal: 'larger', target: null, rangeMin: 0.3, rangeMax: 1.5 },
      { name: 'Neck angle', symbol: 'psi', unit: 'deg', decimals: 1, goal: 'scatter', target: null, rangeMin: 40, rangeMax: 75 },
    ],
  });
  commitPlan(db, actor, id, { design: 'full', replicates: 3, blocks: 'none', centrePoints: 0, seed: SEED, randomise: true });

  const setup = loadSetup(db, id);
  const outcome = (label: string) => setup.outcomes.find((o) => o.label === label)!.id;
  const invalid = new Map<number, { label: string; reason: string; keepValues: boolean }>([
    [7, { label: 'brittle fracture', reason: 'Crack from the notch root before a neck formed', keepValues: false }],
    [19, { label: 'diffuse neck', reason: 'Neck spread over the whole reduced section; angle not defined', keepValues: true }],
    [33, { label: 'fracture outside the gauge region', reason: 'Broke at the grip radius', keepValues: true }],
    [46, { label: 'measurement lost', reason: 'Camera stopped recording at 60 % of the test', keepValues: false }],
  ]);
  const gauss = normal(mulberry32(SEED));
  const edits: EditInput[] = loadRuns(db, id, { setup }).map((run) => {
    const x1 = (Number(run.settings['w']) - 0.5) / 0.2;
    const x2 = (Number(run.settings['th']) - 60) / 30;
    const x3 = run.settings['rt'] === '0.5' ? -1 : 1;
    const h = 0.52 + 0.06 * x1 - 0.03 * x2 + 0.01 * x3 + 0.04 * x1 * x2 + gauss() * (x3 < 0 ? 0.016 : 0.008);
    const r = 0.78 + 0.05 * x1 + 0.02 * x2 - 0.03 * x1 * x2 + gauss() * 0.02;
    const psi = 58 - 4 * x1 + 2.5 * x2 + 1.5 * x1 * x2 + gauss() * 1.2;
    const wMeasured = Number(run.settings['w']) + gauss() * 0.004;
    const day = new Date(Date.UTC(2026, 1, 2 + Math.floor((run.runOrder - 1) / 6)));
    const bad = invalid.get(run.runOrder);
    const edit: EditInput = { runId: run.id, operator: 'T. Okafor (fictional)', testedOn: day.toISOString().slice(0, 10), measured: { w: wMeasured.toFixed(3) } };
    if (!bad || bad.keepValues) edit.values = { H: h.toFixed(3), r: r.toFixed(2), psi: psi.toFixed(1) };
    if (bad) Object.assign(edit, { outcomeId: outcome(bad.label), outcomeReason: bad.reason });
    else edit.outcomeId = outcome('valid');
    return edit;
  });
  db.transaction(() => applyRunEdits(db, actor, id, edits, { pathOf: (i) => `run ${i}`, source: 'demo-seed', reason: 'demo data (invented)' }, setup));
}
