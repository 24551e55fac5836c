import { describe, expect, it } from 'vitest';
import { decodeRunColumns, encodeRunColumns, type Run } from './run-sheet.js';
import { blankRun } from './testing/blank-run.js';

// The column layout is a lossless re-arrangement of the row layout: decode(encode(rows)) must give
// the rows back exactly (common practice, no source). The API test in tests/api/study-revision.spec.ts
// checks the same against the server's own row answer for a real study.

/** Runs with a few fields set the way a sheet has them; the rest empty. */
function run(i: number, over: Partial<Run> = {}): Run {
  return blankRun(100 + i, { code: `R${String(i).padStart(3, '0')}`, standardOrder: 10 - i, runOrder: i, block: i < 2 ? '1' : '2', settings: { W: '0.5', A: i % 2 ? '30' : '60' }, updatedAt: 1_796_000_000_000 + i, ...over });
}

describe('run-sheet column layout', () => {
  it('round-trips every field, including the rare ones', () => {
    const rows: Run[] = [
      run(0, { values: { H: { text: '0.850', value: 0.85, outOfRange: false }, r: { text: '1.20', value: 1.2, outOfRange: false } } }),
      run(1, { values: { H: { text: '7.5', value: 7.5, outOfRange: true } }, measured: { W: { text: '0.512', value: 0.512 } }, notes: 'regripped "twice"', operator: 'K. Osei' }),
      run(2, { centrePoint: true, settings: { W: '0.55', A: '45' }, outcomeId: 9, outcomeReason: 'cracked at the root', excluded: true, attachmentCount: 3, version: 4 }),
      run(3, { removedAt: 1_796_000_100_000, removedReason: 'duplicate specimen', excluded: true, settings: { W: '0.5' } }),
      run(4, { testedOn: '2026-11-30', values: { r: { text: '-0', value: -0, outOfRange: false } } }),
      // ids, run orders and save times that step backwards (delta-coded columns)
      run(5, { id: 7, runOrder: 2, updatedAt: 1_700_000_000_000 }),
    ];
    const back = decodeRunColumns(JSON.parse(JSON.stringify(encodeRunColumns(rows))));
    // JSON turns -0 into 0 in both layouts alike; compare against the row layout after the same trip
    expect(back).toEqual(JSON.parse(JSON.stringify(rows)));
  });

  it('keeps a stored number that is not Number(text) through valueExceptions', () => {
    const rows = [run(0, { values: { H: { text: '0.1', value: 0.1000001, outOfRange: false } }, measured: { A: { text: '30', value: 30.5 } } }), run(1)];
    const cols = encodeRunColumns(rows);
    expect(cols.valueExceptions).toEqual([
      ['measured', 'A', 0, 30.5],
      ['values', 'H', 0, 0.1000001],
    ]);
    expect(decodeRunColumns(cols)).toEqual(rows);
  });

  it('handles an empty sheet', () => {
    const cols = encodeRunColumns([]);
    expect(cols.count).toBe(0);
    expect(decodeRunColumns(cols)).toEqual([]);
  });

  it('is smaller than the row layout for a sheet of many runs', () => {
    const rows = Array.from({ length: 500 }, (_, i) => run(i, { values: { H: { text: (0.5 + i / 1000).toFixed(3), value: Number((0.5 + i / 1000).toFixed(3)), outOfRange: false } } }));
    expect(JSON.stringify(encodeRunColumns(rows)).length).toBeLessThan(JSON.stringify(rows).length / 3);
  });
});
