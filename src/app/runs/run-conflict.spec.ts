import { blankRun } from '../../../shared/testing/blank-run';
import type { Outcome, Response, Run } from '../studies/study-types';
import { cellChange, cellSpecs } from './run-cells';
import { cellConflict } from './run-conflict';

const H: Response = { id: 1, position: 0, name: 'H', symbol: 'H', unit: '', decimals: 3, goal: 'larger', target: null, rangeMin: 0.5, rangeMax: 2 };
const outcomes: Outcome[] = [{ id: 1, position: 0, label: 'valid', valid: true }];
const specs = cellSpecs([], [H]);
const spec = specs.get('val:H')!;
const stored = (text: string | null, version: number): Run =>
  blankRun(7, { values: text === null ? {} : { H: { text, value: Number(text), outOfRange: false } }, version });

describe('cellConflict (stale per-cell save, HTTP 409)', () => {
  // docs/api-studies.md: a stale version gets 409 and the grid shows the conflict instead of overwriting.
  const edit = { runId: 7, version: 3, values: { H: '0.912' } };

  it('shows what I typed against what is stored now, and retries on the current version', () => {
    const conflict = cellConflict(spec, edit, '0.900', '0.912', stored('0.905', 4), outcomes);
    expect(conflict).toEqual({ runCode: 'R007', column: 'H', before: '0.900', mine: '0.912', theirs: '0.905', retry: { runId: 7, version: 4, values: { H: '0.912' } } });
  });

  it('needs no decision when the other change stored exactly my value', () => {
    expect(cellConflict(spec, edit, '0.900', '0.912', stored('0.912', 4), outcomes)).toBeNull();
  });

  it('treats a value someone cleared as a real conflict (empty theirs)', () => {
    expect(cellConflict(spec, edit, '0.900', '0.912', stored(null, 5), outcomes)?.theirs).toBe('');
  });

  it('never retries on the stale version', () => {
    const conflict = cellConflict(spec, edit, '', '0.912', stored('1.000', 9), outcomes);
    expect(conflict?.retry.version).toBe(9);
  });
});

describe('cellChange (one typed value to a run edit)', () => {
  it('keeps the text as typed and clears on empty', () => {
    expect(cellChange(spec, ' 0.850 ', outcomes)).toEqual({ fields: { values: { H: '0.850' } } });
    expect(cellChange(spec, '', outcomes)).toEqual({ fields: { values: { H: null } } });
  });

  it('refuses a comma decimal mark and extra decimals with the fix', () => {
    // shared/studies.ts DECIMAL_RE refuses "1,5" rather than guessing (1,500 is ambiguous).
    expect(cellChange(spec, '1,5', outcomes)).toEqual({ error: '"1,5": use a point as the decimal mark' });
    expect(cellChange(spec, '0.8501', outcomes)).toEqual({ error: '"0.8501" has more than 3 decimals' });
  });
});
