import type { StudyRole } from '../../../shared/roles';
import type { ImportErrorKind, ImportRowError, PlanBody, RunFields } from '../../../shared/runs';
import type { CellValue, Run, SheetValue } from '../../../shared/run-sheet';
import type { ApprovalState, StudyStatus } from '../../../shared/studies';

/**
 * The shapes the studies API answers with (docs/api-studies.md). Request bodies come from
 * shared/studies.ts and shared/runs.ts; the server keeps its answer types beside its services, which
 * the client cannot import, so they are restated here from the contract (the run itself is shared:
 * shared/run-sheet.ts).
 */

export type ViewerRole = StudyRole | 'admin';

export interface Progress {
  planned: number;
  recorded: number;
  invalid: number;
  removed: number;
}

export interface StudySummary {
  id: number;
  title: string;
  status: StudyStatus;
  materialGrade: string;
  batch: string;
  thicknessMm: number | null;
  specimenFamily: string;
  owner: { id: number; name: string };
  myRole: ViewerRole;
  createdAt: number;
  updatedAt: number;
  progress: Progress;
  /** set while the study is approved */
  approval: ApprovalState | null;
}

export interface Level {
  value: string;
  label?: string;
}

export interface Factor {
  id: number;
  position: number;
  name: string;
  symbol: string;
  unit: string;
  kind: 'numeric' | 'categorical';
  levels: Level[];
  tracksMeasured: boolean;
}

export type ResponseGoal = 'nominal' | 'smaller' | 'larger' | 'scatter';

export interface Response {
  id: number;
  position: number;
  name: string;
  symbol: string;
  unit: string;
  decimals: number;
  goal: ResponseGoal;
  target: number | null;
  rangeMin: number | null;
  rangeMax: number | null;
}

export interface Outcome {
  id: number;
  position: number;
  label: string;
  valid: boolean;
}

export interface Member {
  userId: number;
  name: string;
  email: string;
  accountRole: string;
  role: StudyRole;
  addedAt: number;
}

export interface AliasRow {
  effect: string;
  aliases: string[];
}

export interface TermPower {
  term: string;
  df: number;
  dfError: number;
  cohenF: number | null;
  ncp: number | null;
  fCrit: number;
  power: number | null;
  note?: string;
}

export interface PlanSummary {
  design: 'full' | 'fractional';
  runCount: number;
  factors: { symbol: string; levels: string[] }[];
  replicates: number;
  blocks: PlanBody['blocks'];
  centrePoints: number;
  seed: number;
  randomise: boolean;
  resolution?: number;
  definingRelation?: string;
  generators?: string[];
  aliases?: AliasRow[];
  power?: TermPower[];
  replicatesForTarget?: number;
  notes: string[];
}

export interface PreviewRun {
  standardOrder: number;
  runOrder: number;
  block: string;
  centrePoint: boolean;
  settings: Record<string, string>;
}

export type PlanPreview = PlanSummary & { runs: PreviewRun[] };

export interface Plan {
  id: number;
  spec: PlanBody;
  summary: PlanSummary;
  createdAt: number;
  createdBy: number;
  createdByName: string;
}

export interface StudyDetail extends StudySummary {
  purpose: string;
  materialDescription: string;
  orientationDeg: number | null;
  version: number;
  allowedTransitions: StudyStatus[];
  factors: Factor[];
  responses: Response[];
  outcomes: Outcome[];
  members: Member[];
  plan: Plan | null;
}

export type { CellValue, Run, SheetValue };

export interface RunSheet {
  studyId: number;
  version: number;
  factors: Factor[];
  responses: Response[];
  outcomes: Outcome[];
  counts: Progress;
  runs: Run[];
}

export interface AuditEvent {
  id: number;
  at: number;
  user: { id: number; name: string } | null;
  tokenId: number | null;
  entity: string;
  entityId: string | null;
  action: string;
  field: string | null;
  oldValue: string | null;
  newValue: string | null;
  reason: string | null;
  runId: number | null;
  runCode: string | null;
}

export interface Attachment {
  id: number;
  runId: number;
  fileName: string;
  mimeType: string;
  sizeBytes: number;
  sha256: string;
  kind: string;
  uploadedBy: { id: number; name: string };
  createdAt: number;
  deletedAt: number | null;
  deletedReason: string | null;
}

export interface ImportPreview {
  id: number;
  fileName: string;
  status: 'preview' | 'committed' | 'discarded';
  rowCount: number;
  errorCount: number;
  headers: string[];
  mapping: { columns: Record<string, string> };
  errors: ImportRowError[];
  sample: { row: number; runCode: string; changes: RunFields & { runId: number } }[];
}

export const IMPORT_ERROR_LABELS: Record<ImportErrorKind, string> = {
  'unknown-level': 'Unknown level',
  'non-numeric': 'Not a number',
  'duplicate-run': 'Run listed twice',
  'unmatched-run': 'No matching run',
  'unknown-outcome': 'Unknown outcome',
  'bad-field': 'Bad value',
  'missing-key': 'No run key',
};

/** Study roles that may change the study (the server's EDITOR_ROLES, plus admins who pass every check). */
export function canEditStudy(role: ViewerRole | undefined): boolean {
  return role === 'owner' || role === 'contributor' || role === 'admin';
}

export function canManageMembers(role: ViewerRole | undefined): boolean {
  return role === 'owner' || role === 'admin';
}
