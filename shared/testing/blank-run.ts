import type { Run } from '../run-sheet.js';

/** A run with nothing recorded yet, for tests: every field at its empty value, then `over`. */
export function blankRun(id: number, over: Partial<Run> = {}): Run {
  return {
    id,
    code: `R${String(id).padStart(3, '0')}`,
    standardOrder: id,
    runOrder: id,
    block: '1',
    centrePoint: false,
    settings: {},
    measured: {},
    values: {},
    outcomeId: null,
    outcomeReason: '',
    excluded: false,
    operator: '',
    testedOn: '',
    notes: '',
    attachmentCount: 0,
    removedAt: null,
    removedReason: null,
    version: 1,
    updatedAt: 0,
    ...over,
  };
}
