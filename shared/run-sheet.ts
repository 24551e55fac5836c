/**
 * One run of the run sheet as the API sends it (GET /api/studies/:id/runs): read by the server's
 * run-sheet service and the client's grid alike.
 */

export interface CellValue {
  text: string;
  value: number;
}
export interface SheetValue extends CellValue {
  outOfRange: boolean;
}

export interface Run {
  id: number;
  code: string;
  standardOrder: number;
  runOrder: number;
  block: string;
  centrePoint: boolean;
  settings: Record<string, string>;
  measured: Record<string, CellValue>;
  values: Record<string, SheetValue>;
  outcomeId: number | null;
  outcomeReason: string;
  /** Not counted in the analysis: the outcome is marked not valid, or the run was removed. */
  excluded: boolean;
  operator: string;
  testedOn: string;
  notes: string;
  attachmentCount: number;
  removedAt: number | null;
  removedReason: string | null;
  version: number;
  updatedAt: number;
}
