import type { Progress, Run } from '../studies/study-types';

/**
 * The counts above the sheet, from the rows as they stand after the last save (the server's own
 * counts are only as fresh as the last load). Same rules as the server's progress: planned = not
 * removed; recorded = at least one response value; invalid = excluded by a not-valid outcome.
 */
export function sheetCounts(runs: readonly Run[]): Progress {
  let planned = 0;
  let recorded = 0;
  let invalid = 0;
  let removed = 0;
  for (const r of runs) {
    if (r.removedAt !== null) {
      removed++;
      continue;
    }
    planned++;
    if (Object.keys(r.values).length > 0) recorded++;
    if (r.excluded) invalid++;
  }
  return { planned, recorded, invalid, removed };
}
