import { z } from 'zod';
import type { AnalysisResult, SsType } from '../server/stats/types.js';

/**
 * Analyses, review, sign-off and recommendations: the request bodies the API validates and the
 * response shapes the Angular client reads. The engine's result type lives with the engine
 * (server/stats/types.ts, pure types) and is re-exported here so the client imports one module.
 */
export type { AnalysisResult, SsType };
export type {
  AnovaEffectRow,
  AnovaResidualRow,
  AnovaRow,
  GroupDescriptives,
  PlotPoint,
  TukeyComparison,
} from '../server/stats/types.js';

const SYMBOL_RE = /^[A-Za-z][A-Za-z0-9_]{0,23}$/;
const sym = (what: string) => z.string().trim().regex(SYMBOL_RE, `${what}: a study symbol (a letter, then letters, digits or _)`);

/** A model term: a factor symbol, or symbols joined by ':' for an interaction ("A:B"). */
export const termSchema = z
  .string()
  .trim()
  .regex(/^[A-Za-z]\w*(:[A-Za-z]\w*)*$/, 'A term is a factor symbol or symbols joined by ":" (e.g. A or A:B)');

export const TEST_NAMES = ['tukey', 'welch', 'levene', 'brown-forsythe', 'bartlett', 'kruskal', 'shapiro'] as const;

/**
 * What to analyse. Defaults: all main effects and all two-factor interactions of the chosen
 * factors, Type II sums of squares, alpha 0.05, invalid runs excluded, every assumption check.
 */
const specFields = z.object({
  response: sym('response'),
  factors: z.array(sym('factors')).min(1, 'Choose at least one factor').max(10, 'At most 10 factors'),
  terms: z.array(termSchema).min(1, 'Give at least one model term').max(64).optional(),
  ssType: z.union([z.literal(1), z.literal(2), z.literal(3)], { message: 'ssType must be 1, 2 or 3' }).default(2),
  alpha: z.number().gt(0, 'alpha must be above 0').max(0.2, 'alpha must be at most 0.2').default(0.05),
  excludeInvalid: z.boolean().default(true),
  /** Tukey comparisons for the significant terms (always computed when saving). */
  posthoc: z.boolean().default(true),
});

function checkSpec(s: z.infer<typeof specFields>, ctx: z.RefinementCtx): void {
  const seen = new Set<string>();
  s.factors.forEach((f, i) => {
    if (seen.has(f)) ctx.addIssue({ code: 'custom', path: ['factors', i], message: `Factor "${f}" is chosen twice` });
    seen.add(f);
  });
  (s.terms ?? []).forEach((t, i) => {
    for (const part of t.split(':')) {
      if (!seen.has(part)) ctx.addIssue({ code: 'custom', path: ['terms', i], message: `Term "${t}" uses "${part}", which is not among the chosen factors (${s.factors.join(', ')})` });
    }
  });
}

export const analysisSpec = specFields.superRefine(checkSpec);
export type AnalysisSpecInput = z.input<typeof analysisSpec>;
export type AnalysisSpecParsed = z.infer<typeof analysisSpec>;
/** A spec with its defaults filled in, as stored with a saved analysis. */
export type AnalysisSpec = AnalysisSpecParsed & { terms: string[] };

/** The default model: main effects, then every two-factor interaction in factor order. */
export function defaultTerms(factors: readonly string[]): string[] {
  const out = [...factors];
  for (let i = 0; i < factors.length; i++) for (let j = i + 1; j < factors.length; j++) out.push(`${factors[i]}:${factors[j]}`);
  return out;
}

export const saveAnalysisBody = specFields
  .extend({ title: z.string().trim().min(1, 'Title must not be empty').max(200, 'Title: use at most 200 characters').optional() })
  .superRefine(checkSpec);

export const reviewRequestBody = z.object({
  reviewerIds: z.array(z.number().int().positive()).min(1, 'Choose at least one reviewer').max(20),
  message: z.string().trim().max(2000, 'Message: use at most 2000 characters').default(''),
});
export type ReviewRequestBody = z.infer<typeof reviewRequestBody>;

/**
 * Where a comment points: the analysis as a whole ("analysis"), or a panel item written
 * "<panel>:<item>", e.g. "anova:A:B" (a table row), "chart:interaction:A:B", "tukey:B-A", "notes:2".
 */
export const anchorSchema = z
  .string()
  .trim()
  .regex(/^(analysis|[a-z][a-z-]{0,30}:[^\s].{0,159})$/, 'anchor is "analysis" or "<panel>:<item>", e.g. "anova:A:B" or "chart:main-effects:A"');

export const commentBody = z.object({
  body: z.string().trim().min(1, 'Write a comment').max(8000, 'Comment: use at most 8000 characters'),
  anchor: anchorSchema.optional(),
  parentId: z.number().int().positive().optional(),
});
export type CommentBody = z.infer<typeof commentBody>;

export const resolveBody = z.object({ resolved: z.boolean().default(true) });

export const returnBody = z.object({ reason: z.string().trim().min(3, 'Say why the analysis is returned (at least 3 characters)').max(4000) });
export const approveBody = z.object({ note: z.string().trim().max(2000).optional() });

export const recommendationSetting = z.object({
  factor: sym('factor'),
  level: z.string().trim().min(1, 'Give the chosen level').max(60),
  toleranceMinus: z.number().min(0, 'A tolerance is a non-negative width').optional(),
  tolerancePlus: z.number().min(0, 'A tolerance is a non-negative width').optional(),
});
export const recommendationBody = z.object({
  analysisId: z.number().int().positive(),
  settings: z.array(recommendationSetting).min(1, 'Choose a level for at least one factor').max(10),
  rationale: z.string().trim().min(10, 'Give a rationale (at least 10 characters)').max(8000),
});
export type RecommendationBody = z.infer<typeof recommendationBody>;

export const notificationsQuery = z.object({ unread: z.enum(['0', '1', 'true', 'false']).optional() });

// ---------------------------------------------------------------- response shapes

/** How the runs of the study were used; always shown beside results. */
export interface RunCounts {
  /** runs in the study, removed ones included */
  total: number;
  used: number;
  removed: number;
  /** centre points: they sit outside the factorial levels and are left out of the ANOVA */
  centrePoints: number;
  /** runs with an invalid outcome, excluded (0 when excludeInvalid is false) */
  excludedInvalid: number;
  byReason: { outcome: string; count: number }[];
  /** runs with an invalid outcome that were kept because excludeInvalid is false */
  invalidIncluded: number;
  /** runs with no value for the response */
  missingValue: number;
}

/** Short plain-language readings, one per result panel. */
export interface Readings {
  descriptives: string;
  anova: string;
  notes: string;
  assumptions: string;
  posthoc: string;
  dispersion: string;
}

/** One run as used by an analysis: the frozen snapshot row and the unit of the data hash. */
export interface SnapshotRow {
  runId: number;
  code: string;
  settings: Record<string, string>;
  /** the response value exactly as entered */
  value: string;
  /** label of the run's outcome, null when none was recorded */
  outcome: string | null;
}

export interface DataChanges {
  added: { runId: number; code: string; value: string }[];
  removed: { runId: number; code: string; value: string; why: string }[];
  edited: { runId: number; code: string; field: string; oldValue: string | null; newValue: string | null }[];
}

/** Tukey HSD for one significant term, with the model's residual mean square (R's TukeyHSD on the model). */
export interface PosthocTerm {
  term: string;
  groups: { label: string; n: number; mean: number }[];
  /** diff = mean(b) - mean(a), simultaneous interval at confLevel, adjusted p */
  comparisons: { a: string; b: string; diff: number; lower: number; upper: number; p: number }[];
  mse: number;
  df: number;
  confLevel: number;
}

export interface PreviewResponse {
  result: AnalysisResult;
  /** Tukey HSD per significant term (empty when none is significant or posthoc was false) */
  posthoc: PosthocTerm[];
  counts: RunCounts;
  summary: string;
  readings: Readings;
  /** run code per engine input row (fitted/residuals are in this order) */
  rowCodes: string[];
  dataHash: string;
}

/** What is stored in analyses.result. */
export interface StoredResult {
  engine: AnalysisResult;
  posthoc: PosthocTerm[];
  counts: RunCounts;
  summary: string;
  readings: Readings;
  rowCodes: string[];
}

export type AnalysisStatus = 'draft' | 'in_review' | 'returned' | 'approved';

export interface UserRef {
  id: number;
  name: string;
}

export interface AnalysisSummaryItem {
  id: number;
  studyId: number;
  title: string;
  status: AnalysisStatus;
  spec: AnalysisSpec;
  engineVersion: string;
  dataHash: string;
  stale: boolean;
  createdBy: UserRef;
  createdAt: number;
  approvedBy: UserRef | null;
  approvedAt: number | null;
  returnedReason: string | null;
}

export interface ReviewRequestItem {
  id: number;
  reviewer: UserRef & { role: string };
  requestedBy: UserRef;
  message: string;
  createdAt: number;
}

export interface AnalysisDetail extends AnalysisSummaryItem {
  result: AnalysisResult;
  posthoc: PosthocTerm[];
  counts: RunCounts;
  summary: string;
  readings: Readings;
  rowCodes: string[];
  /** hash of the same selection over today's data */
  currentHash: string;
  changes: DataChanges | null;
  reviewRequests: ReviewRequestItem[];
  study: { id: number; title: string; status: string; ownerId: number };
  /** what the caller may do now, with the reason when not */
  can: { requestReview: boolean; comment: boolean; approve: boolean; approveRefusal: string | null };
  link: string;
}

export interface CommentItem {
  id: number;
  parentId: number | null;
  anchor: string;
  body: string;
  user: UserRef;
  createdAt: number;
  resolvedAt: number | null;
  resolvedBy: UserRef | null;
}
export interface CommentThread extends CommentItem {
  replies: CommentItem[];
}

export interface NotificationItem {
  id: number;
  kind: string;
  message: string;
  link: string | null;
  readAt: number | null;
  createdAt: number;
}

export interface RecommendationItem {
  id: number;
  studyId: number;
  analysisId: number;
  settings: { factor: string; level: string; toleranceMinus?: number; tolerancePlus?: number; unit: string }[];
  rationale: string;
  createdBy: UserRef;
  createdAt: number;
  /** link to the approved analysis the recommendation rests on */
  analysisLink: string;
  /** true when the analysis's data have changed since (the recommendation should be revisited) */
  stale: boolean;
}
