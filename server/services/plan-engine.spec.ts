import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { planBody } from '../../shared/runs.js';
import { HttpError } from '../http-error.js';
import { generatePlan, type GeneratedRun } from './plan-engine.js';
import type { FactorRow, Setup } from './study-setup.js';

// R 4.2.2 + mpmath 1.3.0 one-way power grid (shared/reference/r-datasets/power-oneway.json)
const ref = JSON.parse(readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/power-oneway.json'), 'utf8')) as {
  rows: { k: number; n: number; f: number; df1: number; df2: number; ncp: number; powerHighPrecision: number }[];
};

let nextId = 1;
function factor(symbol: string, kind: 'numeric' | 'categorical', values: string[]): FactorRow {
  const id = nextId++;
  return { id, studyId: 1, position: id, name: symbol, symbol, unit: '', kind, levels: values.map((value) => ({ value })), tracksMeasured: false };
}
const setup = (factors: FactorRow[]): Setup => ({ factors, responses: [], outcomes: [] });
const twoLevel = (k: number) => setup(Array.from({ length: k }, (_, i) => factor(`f${i}`, 'numeric', ['1.0', '2.0'])));
const refused = (fn: () => unknown): HttpError => {
  try {
    fn();
  } catch (err) {
    if (err instanceof HttpError) return err;
    throw err;
  }
  throw new Error('expected a refusal');
};

describe('generatePlan: centre points on a two-level full factorial', () => {
  // Neck width ratio, notch opening angle and root radius, each at two typed levels
  const geometry = setup([factor('w', 'numeric', ['0.50', '0.80']), factor('ang', 'numeric', ['30', '60']), factor('r', 'numeric', ['0.5', '2'])]);
  const body = planBody.parse({ design: 'full', replicates: 2, blocks: 'perReplicate', centrePoints: 3, seed: 17 });

  it('adds 3 centre runs per block to the 2^3 x 2: 22 runs, centres at the midpoints, after the factorial runs', () => {
    // 2^3 x 2 replicates + 3 centre points in each of the 2 blocks = 16 + 6 (Montgomery, Design and
    // Analysis of Experiments, §6.8, centre points per block, from memory); midpoints by arithmetic:
    // (0.50 + 0.80)/2 = 0.65, (30 + 60)/2 = 45, (0.5 + 2)/2 = 1.25
    const plan = generatePlan(geometry, body);
    expect(plan.runs).toHaveLength(22);
    expect(plan.summary).toMatchObject({ design: 'full', runCount: 22, centrePoints: 3 });
    expect(plan.summary).not.toHaveProperty('resolution');
    const centres = plan.runs.filter((r) => r.centrePoint);
    expect(centres.map((r) => r.settings)).toEqual(Array(6).fill({ w: '0.65', ang: '45', r: '1.25' }));
    expect(centres.map((r) => r.standardOrder).sort((a, b) => a - b)).toEqual([17, 18, 19, 20, 21, 22]);
    const inBlock = (b: string): GeneratedRun[] => plan.runs.filter((r) => r.block === b);
    expect(inBlock('Block 1').filter((r) => r.centrePoint)).toHaveLength(3);
    expect(inBlock('Block 2').filter((r) => r.centrePoint)).toHaveLength(3);
    // randomised within the block: block 1 takes run orders 1..11, block 2 12..22
    expect(inBlock('Block 1').map((r) => r.runOrder).sort((a, b) => a - b)).toEqual([...Array(11).keys()].map((i) => i + 1));
    // the factorial runs keep the typed level text and cover all 8 cells twice
    const cells = new Set(plan.runs.filter((r) => !r.centrePoint).map((r) => JSON.stringify(r.settings)));
    expect(cells.size).toBe(8);
    expect([...cells].every((c) => /"w":"0\.(50|80)"/.test(c))).toBe(true);
  });

  it('is reproducible for a seed and puts the centre points in total without blocks', () => {
    const a = generatePlan(geometry, body).runs.map((r) => r.standardOrder);
    expect(generatePlan(geometry, body).runs.map((r) => r.standardOrder)).toEqual(a);
    const unblocked = generatePlan(geometry, { ...body, blocks: 'none' });
    expect(unblocked.runs).toHaveLength(19);
    expect(unblocked.runs.filter((r) => r.centrePoint).every((r) => r.block === '1')).toBe(true);
  });

  it('refuses centre points when a factor has three levels or is categorical, saying why', () => {
    const three = refused(() => generatePlan(setup([factor('w', 'numeric', ['0.5', '0.65', '0.8']), factor('ang', 'numeric', ['30', '60'])]), body));
    expect(three.status).toBe(400);
    expect(three.message).toMatch(/every factor is numeric with exactly two levels.*factor "w" has 3 levels/);
    const cat = refused(() => generatePlan(setup([factor('w', 'numeric', ['0.5', '0.8']), factor('shape', 'categorical', ['round', 'vee'])]), body));
    expect(cat.message).toMatch(/factor "shape" is categorical/);
    // the same factors without centre points still plan
    expect(generatePlan(setup([factor('w', 'numeric', ['0.5', '0.65', '0.8'])]), { ...body, centrePoints: 0 }).runs).toHaveLength(6);
  });

  it('counts only the factorial runs in the power, and says so', () => {
    // the analysis leaves centre points out (analysis-data.ts), so 2^3 x 2 in 2 blocks: error 16 - 1 - 1 - 7 = 7
    const plan = generatePlan(geometry, { ...body, power: { effect: { kind: 'cohenF', f: 0.5 }, alpha: 0.05 } });
    const power = plan.summary.power as { dfError: number; ncp: number }[];
    expect(power.every((p) => p.dfError === 7 && p.ncp === 16 * 0.25)).toBe(true);
    expect(plan.summary.notes).toContain('Power counts the factorial runs only: the analysis leaves the centre points out.');
  });
});

describe('generatePlan: power of 2^(k-p) fractions', () => {
  const difference = (delta: number) => ({ effect: { kind: 'difference' as const, delta, sigma: 1 }, alpha: 0.05 });

  it('fits main effects and the clear interaction chains of a 2^(4-1) and matches the mpmath power', () => {
    // I = ABCD: AB = CD, AC = BD, AD = BC (Box, Hunter & Hunter 2005, ch. 6); 2 x 8 runs leave
    // 16 - 1 - 7 = 8 error df; Δ = √0.4 σ gives λ = N Δ²/(4σ²) = 1.6 (from memory); power-oneway.json
    // k = 2, n = 5, f = 0.4 is the same F(1, 8, λ 1.6) test: mpmath powerHighPrecision
    const plan = generatePlan(twoLevel(4), planBody.parse({ design: 'fractional', fraction: { p: 1 }, replicates: 2, seed: 3, power: difference(Math.sqrt(0.4)) }));
    const power = plan.summary.power as { term: string; dfError: number; power: number | null }[];
    expect(power.map((p) => [p.term, p.dfError])).toEqual([['f0', 8], ['f1', 8], ['f2', 8], ['f3', 8], ['f0:f1', 8], ['f0:f2', 8], ['f0:f3', 8]]);
    const want = ref.rows.find((r) => r.k === 2 && r.n === 5 && r.f === 0.4)!;
    expect(Math.abs((power[0].power as number) - want.powerHighPrecision) / want.powerHighPrecision).toBeLessThan(1e-12);
    expect(power[4].power).toBeNull(); // a difference defines main effects only, as for full factorials
    expect(plan.summary.notes).toContain('Power of the 2^(4-1) fraction is for the model of the main effects and the two-factor interactions clear of them (f0:f1 = f2:f3, f0:f2 = f1:f3, f0:f3 = f1:f2); each term is tested together with its aliases.');
    expect((plan.summary.notes as string[]).some((n) => /computed for full factorial plans only/.test(n))).toBe(false);
  });

  it('leaves aliased interactions out of a resolution III model: 2^(5-2) keeps BC = DE and BE = CD', () => {
    // D = AB, E = AC (Montgomery's 2^(5-2) example, from memory); 2 x 8 runs: error 16 - 1 - 7 = 8
    const plan = generatePlan(twoLevel(5), planBody.parse({ design: 'fractional', fraction: { p: 2 }, replicates: 2, seed: 3, power: { effect: { kind: 'cohenF', f: 0.5 }, alpha: 0.05 } }));
    const power = plan.summary.power as { term: string; dfError: number }[];
    expect(power.map((p) => p.term)).toEqual(['f0', 'f1', 'f2', 'f3', 'f4', 'f1:f2', 'f1:f4']);
    expect(power.every((p) => p.dfError === 8)).toBe(true);
  });

  it('gives a note, not a failure, when one replicate leaves no error df, and still finds replicates for the target', () => {
    const plan = generatePlan(twoLevel(4), planBody.parse({ design: 'fractional', fraction: { p: 1 }, replicates: 1, seed: 3, power: { ...difference(1), targetPower: 0.8 } }));
    expect(plan.summary.power).toBeUndefined();
    expect(plan.summary.notes).toContain('Power not available: the plan leaves 0 error degrees of freedom (8 runs, 1 blocks, 7 model df): add replicates or drop model terms');
    const r = plan.summary.replicatesForTarget as number;
    // the replicate count found reaches 0.8 and one fewer does not
    const at = (reps: number) => (generatePlan(twoLevel(4), planBody.parse({ design: 'fractional', fraction: { p: 1 }, replicates: reps, seed: 3, power: difference(1) })).summary.power as { power: number }[])[0].power;
    expect(r).toBeGreaterThan(2); // 2 replicates: λ = 16/4 = 4 on 8 error df is far below 0.8
    expect(at(r)).toBeGreaterThanOrEqual(0.8);
    expect(at(r - 1)).toBeLessThan(0.8);
  });
});
