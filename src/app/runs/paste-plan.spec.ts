import { blankRun } from '../../../shared/testing/blank-run';
import type { Factor, Outcome, Response, Run } from '../studies/study-types';
import { parseTsv } from './paste-parser';
import { planPaste } from './paste-plan';
import { cellSpecs } from './run-cells';

const factor: Factor = { id: 1, position: 0, name: 'Neck width ratio', symbol: 'w', unit: '', kind: 'numeric', levels: [{ value: '0.3' }, { value: '0.6' }], tracksMeasured: true };
const response = (symbol: string, decimals: number): Response => ({ id: symbol.length, position: 0, name: symbol, symbol, unit: '', decimals, goal: 'larger', target: null, rangeMin: null, rangeMax: null });
const outcomes: Outcome[] = [
  { id: 1, position: 0, label: 'valid', valid: true },
  { id: 2, position: 1, label: 'brittle fracture', valid: false },
];
const run = (id: number, extra: Partial<Run> = {}): Run => blankRun(id, { code: `R00${id}`, settings: { w: '0.3' }, version: 10 + id, ...extra });

const specs = cellSpecs([factor], [response('H', 3), response('r', 2)]);
const runs = new Map([1, 2, 3].map((id) => [id, run(id)]));
const cols = ['val:H', 'val:r', 'outcome', 'outcomeReason', 'operator', 'testedOn', 'notes', 'attachments'];

describe('planPaste (block from the focused cell to one batch)', () => {
  it('turns a 2x2 block into one edit per run carrying that run’s version', () => {
    const plan = planPaste(parseTsv('0.812\t1.05\r\n0.790\t0.98\r\n'), { rowIds: [2, 3], colIds: cols }, runs, specs, outcomes);
    expect(plan.errors).toEqual([]);
    expect(plan.cellCount).toBe(4);
    expect(plan.edits).toEqual([
      { runId: 2, version: 12, values: { H: '0.812', r: '1.05' } },
      { runId: 3, version: 13, values: { H: '0.790', r: '0.98' } },
    ]);
  });

  it('maps outcome labels to ids (case-insensitive) and clears on an empty cell', () => {
    const plan = planPaste([['Brittle Fracture', 'edge crack'], ['', '']], { rowIds: [1, 2], colIds: ['outcome', 'outcomeReason'] }, runs, specs, outcomes);
    expect(plan.edits).toEqual([
      { runId: 1, version: 11, outcomeId: 2, outcomeReason: 'edge crack' },
      { runId: 2, version: 12, outcomeId: null, outcomeReason: '' },
    ]);
  });

  it('refuses the whole block when one value is bad, naming run, column and the fix', () => {
    const plan = planPaste([['0.8'], ['1,5'], ['0.8123']], { rowIds: [1, 2, 3], colIds: cols }, runs, specs, outcomes);
    expect(plan.edits).toEqual([]);
    expect(plan.errors).toEqual(['Run R002, H: "1,5": use a point as the decimal mark', 'Run R003, H: "0.8123" has more than 3 decimals']);
  });

  it('refuses a block that overhangs the shown rows or columns', () => {
    const tall = planPaste([['1'], ['2'], ['3']], { rowIds: [2, 3], colIds: cols }, runs, specs, outcomes);
    expect(tall.errors[0]).toContain('3 rows but only 2 runs');
    const wide = planPaste([['1', '2', '3']], { rowIds: [1], colIds: ['notes', 'attachments'] }, runs, specs, outcomes);
    expect(wide.errors[0]).toContain('3 columns but only 2 columns');
  });

  it('refuses a block over a column that cannot be edited (planned settings)', () => {
    const plan = planPaste([['0.6', '1.0']], { rowIds: [1], colIds: ['set:w', 'val:H'] }, runs, specs, outcomes);
    expect(plan.errors).toEqual(['Column 1 of the block falls on "w (planned)", which cannot be edited']);
  });

  it('refuses to paste into a removed run', () => {
    const withRemoved = new Map(runs).set(2, run(2, { removedAt: 1, removedReason: 'dropped' }));
    const plan = planPaste([['1'], ['2']], { rowIds: [1, 2], colIds: cols }, withRemoved, specs, outcomes);
    expect(plan.errors).toEqual(['Run R002 was removed; restore it before pasting into it']);
  });

  it('refuses an unknown outcome and a bad date with what is allowed', () => {
    const plan = planPaste([['snapped', '14.03.2026']], { rowIds: [1], colIds: ['outcome', 'testedOn'] }, runs, specs, outcomes);
    expect(plan.errors).toEqual([
      'Run R001, Outcome: "snapped" is not an outcome of this study (valid, brittle fracture)',
      'Run R001, Tested on: "14.03.2026" is not a date like 2026-03-14',
    ]);
  });
});
