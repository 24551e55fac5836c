import type { RunEdit } from '../../../shared/runs';
import type { Outcome, Run } from '../studies/study-types';
import { cellChange, mergeFields, type CellSpec, type RunChangeFields } from './run-cells';

/** Where a paste lands: the runs and columns in display order, starting at the focused cell. */
export interface PasteTarget {
  /** Run ids of the displayed rows from the focused row down (sorted/filtered as the user sees them). */
  rowIds: number[];
  /** Column ids of the displayed columns from the focused column rightwards. */
  colIds: string[];
}

export interface PastePlan {
  edits: RunEdit[];
  /** Each problem names the run and column and what to fix; any problem means nothing is sent. */
  errors: string[];
  cellCount: number;
}

/**
 * Lays a parsed block over the sheet from the focused cell and turns it into one batch of run edits.
 * All-or-nothing like the server's batch: a block that overhangs the sheet, covers a column that
 * cannot be edited or holds a bad value is refused whole, with every problem listed.
 */
export function planPaste(block: string[][], target: PasteTarget, runs: ReadonlyMap<number, Run>, specs: ReadonlyMap<string, CellSpec>, outcomes: Outcome[]): PastePlan {
  const errors: string[] = [];
  const width = Math.max(0, ...block.map((r) => r.length));
  if (block.length === 0 || width === 0) return { edits: [], errors: ['The clipboard holds no cells to paste'], cellCount: 0 };
  if (block.length > target.rowIds.length) {
    errors.push(`The block has ${block.length} rows but only ${target.rowIds.length} runs are shown from the focused row down`);
  }
  if (width > target.colIds.length) {
    errors.push(`The block has ${width} columns but only ${target.colIds.length} columns are shown from the focused column rightwards`);
  }
  if (errors.length) return { edits: [], errors, cellCount: 0 };

  for (let c = 0; c < width; c++) {
    const spec = specs.get(target.colIds[c]!);
    if (!spec || spec.kind === 'readonly') errors.push(`Column ${c + 1} of the block falls on "${spec?.label ?? target.colIds[c]}", which cannot be edited`);
  }
  if (errors.length) return { edits: [], errors, cellCount: 0 };

  const byRun = new Map<number, RunChangeFields>();
  let cellCount = 0;
  block.forEach((cells, r) => {
    const run = runs.get(target.rowIds[r]!);
    if (!run) {
      errors.push(`Row ${r + 1} of the block has no run to land on`);
      return;
    }
    if (run.removedAt !== null) {
      errors.push(`Run ${run.code} was removed; restore it before pasting into it`);
      return;
    }
    cells.forEach((text, c) => {
      const spec = specs.get(target.colIds[c]!)!;
      const change = cellChange(spec, text, outcomes);
      cellCount++;
      if ('error' in change) errors.push(`Run ${run.code}, ${spec.label}: ${change.error}`);
      else byRun.set(run.id, mergeFields(byRun.get(run.id) ?? {}, change.fields));
    });
  });
  if (errors.length) return { edits: [], errors, cellCount };
  const edits = [...byRun.entries()].map(([runId, fields]) => ({ ...fields, runId, version: runs.get(runId)!.version }));
  return { edits, errors, cellCount };
}
