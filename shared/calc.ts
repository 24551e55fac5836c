import { z } from 'zod';

/**
 * Response calculator (issue 7): request bodies the API validates and the Angular client's forms
 * share, and the shapes the API answers with. The numbers come from the engine in server/calc/; these
 * types only describe what crosses the wire.
 */

const finite = (what: string) => z.number({ message: `${what} must be a number` }).refine(Number.isFinite, `${what} must be finite`);

export const hillCoefficientsSchema = z.object({ F: finite('F'), G: finite('G'), H: finite('H'), N: finite('N') });
export const lankfordSchema = z.object({ r0: finite('r0'), r45: finite('r45'), r90: finite('r90') });

/** POST /api/calc/hill48 — from Lankford coefficients or from F, G, H, N. */
export const hill48Body = z.discriminatedUnion('from', [
  z.object({ from: z.literal('lankford'), lankford: lankfordSchema }),
  z.object({ from: z.literal('coefficients'), coefficients: hillCoefficientsSchema }),
]);
export type Hill48Body = z.infer<typeof hill48Body>;

const loadAngle = finite('loadAngleDeg').default(0);

/** POST /api/calc/neck-angle — imposed neck θ → predicted relative-displacement angle φ. */
export const neckAngleBody = z.object({
  coefficients: hillCoefficientsSchema,
  neckAngleDeg: finite('neckAngleDeg'),
  loadAngleDeg: loadAngle,
});
export type NeckAngleBody = z.infer<typeof neckAngleBody>;

export const hAssumptionSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('normal-anisotropy') }),
  z.object({ kind: z.literal('given-FGN'), F: finite('F'), G: finite('G'), N: finite('N') }),
]);
export type HAssumptionBody = z.infer<typeof hAssumptionSchema>;

/** POST /api/calc/h-from-angle — measured φ at neck angle θ → H. */
export const hFromAngleBody = z.object({
  neckAngleDeg: finite('neckAngleDeg'),
  relativeDisplacementAngleDeg: finite('relativeDisplacementAngleDeg'),
  loadAngleDeg: loadAngle,
  assumption: hAssumptionSchema,
});
export type HFromAngleBody = z.infer<typeof hFromAngleBody>;

// ---------------------------------------------------------------- per-run angle from two points

export const HISTORY_COLUMNS = ['frame', 'u1x', 'u1y', 'u2x', 'u2y'] as const;
export type HistoryColumn = (typeof HISTORY_COLUMNS)[number];

const header = z.string().trim().min(1, 'Choose a column').max(200);
/** Which file column holds the frame (or time) and each in-plane displacement component. */
export const historyMapping = z.object({ frame: header, u1x: header, u1y: header, u2x: header, u2y: header });
export type HistoryMapping = z.infer<typeof historyMapping>;

export const LENGTH_UNITS = ['mm', 'µm', 'm', 'px'] as const;
export const historyUnits = z.object({
  length: z.enum(LENGTH_UNITS, { message: `length unit must be one of ${LENGTH_UNITS.join(', ')}` }),
  frame: z.enum(['frame', 's'], { message: 'the frame column holds a frame number ("frame") or a time in seconds ("s")' }),
});
export type HistoryUnits = z.infer<typeof historyUnits>;

/** Adjustable analysis parameters; omitted ones take the engine defaults (returned with every result). */
export const angleParameters = z.object({
  minRelativeDisplacement: z.number().min(0, 'The ignore-below threshold must be ≥ 0').optional(),
  smoothingWindow: z.number().int().min(1, 'Smoothing window: 1 (off) or an odd number ≥ 3').max(51).optional(),
  plateauHalfBandDeg: z.number().gt(0, 'The plateau band must be > 0°').max(45).optional(),
  minPlateauIncrements: z.number().int().min(2).max(10_000).optional(),
});
export type AngleParameters = z.infer<typeof angleParameters>;

export const angleComputeBody = z.object({
  attachmentId: z.number().int().positive(),
  mapping: historyMapping,
  units: historyUnits,
  parameters: angleParameters.default({}),
});
export type AngleComputeBody = z.infer<typeof angleComputeBody>;

export const ANGLE_METHODS = ['max', 'plateau'] as const;
export type AngleMethod = (typeof ANGLE_METHODS)[number];

export const angleStoreBody = angleComputeBody.extend({
  method: z.enum(ANGLE_METHODS, { message: 'method must be max (early maximum) or plateau' }),
  response: z.string().trim().min(1, 'Choose the response that receives the angle'),
  /** The run version last read (optimistic concurrency, as on the run sheet). */
  version: z.number({ message: 'version is required (the run version you last read)' }).int().positive(),
  reason: z.string().trim().max(1000).optional(),
});
export type AngleStoreBody = z.infer<typeof angleStoreBody>;

const pushedRow = z.object({ frame: z.number(), u1x: z.number().nullable(), u1y: z.number().nullable(), u2x: z.number().nullable(), u2y: z.number().nullable() });

/** JSON push for scripts: rows are kept as a CSV attachment, computed, and stored if `store` is given. */
export const anglePushBody = z.object({
  fileName: z.string().trim().regex(/^[\w.-]{1,120}\.csv$/, 'fileName: letters, digits, _ . - ending in .csv'),
  rows: z.array(pushedRow).min(3, 'Send at least 3 frames').max(200_000),
  units: historyUnits,
  parameters: angleParameters.default({}),
  store: z
    .object({ method: z.enum(ANGLE_METHODS), response: z.string().trim().min(1), version: z.number().int().positive(), reason: z.string().trim().max(1000).optional() })
    .optional(),
});
export type AnglePushBody = z.infer<typeof anglePushBody>;

// ---------------------------------------------------------------- derived H per run

export const neckAngleSource = z.discriminatedUnion('kind', [
  /** A numeric factor holding θ in degrees; its measured value is used where the run has one. */
  z.object({ kind: z.literal('factor'), symbol: z.string().trim().min(1) }),
  z.object({ kind: z.literal('fixed'), valueDeg: finite('neck angle') }),
]);

export const derivedHPreviewBody = z.object({
  /** Response holding each run's relative-displacement angle φ (degrees). */
  angleResponse: z.string().trim().min(1, 'Choose the response with the measured angle'),
  neckAngle: neckAngleSource,
  /** Load axis to RD in degrees; defaults to the study's orientation (0 when not set). */
  loadAngleDeg: finite('loadAngleDeg').optional(),
  assumption: hAssumptionSchema,
});
export type DerivedHPreviewBody = z.infer<typeof derivedHPreviewBody>;

export const derivedHStoreBody = derivedHPreviewBody.extend({
  target: z.object({
    symbol: z.string().trim().regex(/^[A-Za-z][A-Za-z0-9_]{0,23}$/, 'Symbol: start with a letter, then letters, digits or _ (at most 24)'),
    name: z.string().trim().min(1).max(120).default('Estimated H (derived)'),
  }),
  reason: z.string().trim().max(1000).optional(),
});
export type DerivedHStoreBody = z.infer<typeof derivedHStoreBody>;

// ---------------------------------------------------------------- answers

export interface HillCoefficientsDto { F: number; G: number; H: number; N: number }
export interface LankfordDto { r0: number; r45: number; r90: number }
export interface LocusPointDto { s1: number; s2: number }

export interface Hill48Result {
  calcVersion: string;
  coefficients: HillCoefficientsDto;
  lankford: LankfordDto | null;
  locus: { hill: LocusPointDto[]; vonMises: LocusPointDto[]; keyPoints: { uniaxialTD: number; equibiaxial: number; planeStrainRD: LocusPointDto }; normalisation: string };
  /** Free neck in uniaxial tension along RD; null with the reason when none forms. */
  freeNeck: { neckAnglesDeg: [number, number]; relativeDisplacementAnglesDeg: [number, number] } | null;
  freeNeckRefusal: string | null;
  assumptions: string[];
  cautions: string[];
}

export interface NeckAngleResult {
  calcVersion: string;
  neckAngleDeg: number;
  loadAngleDeg: number;
  relativeDisplacementAngleDeg: number;
  thinning: number;
  stress: { xx: number; yy: number; xy: number };
  assumptions: string[];
  cautions: string[];
}

export interface HFromAngleResult {
  calcVersion: string;
  assumption: HAssumptionBody;
  /** H normalised with G + H = 1 */
  H: number;
  coefficients: HillCoefficientsDto;
  r: number | null;
  lankford: LankfordDto | null;
  admissibleAngleRangeDeg: [number, number];
  assumptions: string[];
  cautions: string[];
}

export interface AngleIncrementDto {
  fromFrame: number;
  toFrame: number;
  angleDeg: number | null;
  relativeDisplacement: number;
  spansGap: boolean;
  status: 'used' | 'below-threshold' | 'zero-length';
}

export interface AngleFileInfo {
  attachmentId: number;
  fileName: string;
  sha256: string;
  headers: string[];
  rowCount: number;
  suggestedMapping: Partial<HistoryMapping>;
}

export interface AngleResultDto {
  calcVersion: string;
  file: { attachmentId: number; fileName: string; sha256: string };
  mapping: HistoryMapping;
  units: HistoryUnits;
  parameters: Required<AngleParameters> & { detectReversedOrder: boolean };
  signConvention: string;
  relativeDisplacementDefinition: string;
  curve: AngleIncrementDto[];
  maximum: { angleDeg: number; fromFrame: number; toFrame: number; relativeDisplacement: number } | null;
  plateau: { startFrame: number; endFrame: number; increments: number; meanAngleDeg: number; minAngleDeg: number; maxAngleDeg: number; relativeDisplacementFrom: number; relativeDisplacementTo: number } | null;
  framesUsed: { count: number; first: number | null; last: number | null };
  droppedRows: { row: number; frame: number | null; reason: string }[];
  gaps: { afterFrame: number; beforeFrame: number }[];
  reversedOrder: boolean;
  warnings: string[];
  cautions: string[];
}

/** Stored with a calculated run value (run_values.provenance). */
export interface AngleProvenance {
  kind: 'relative-displacement-angle';
  calcVersion: string;
  attachmentId: number;
  fileName: string;
  sha256: string;
  method: AngleMethod;
  exactValue: number;
  mapping: HistoryMapping;
  units: HistoryUnits;
  parameters: AngleResultDto['parameters'];
  framesUsed: AngleResultDto['framesUsed'];
  /** Frames of the chosen feature: the maximum's increment or the plateau's span. */
  featureFrames: { from: number; to: number };
  reversedOrder: boolean;
  droppedRows: number;
  gaps: number;
  computedAt: number;
}

export interface DerivedHProvenance {
  kind: 'hill-h-from-angle';
  calcVersion: string;
  angleResponse: string;
  angleText: string;
  /** Attachment and checksum behind the angle, when the angle itself was calculated. */
  angleSource: { attachmentId: number; sha256: string; method: AngleMethod } | null;
  neckAngleDeg: number;
  neckAngleFrom: string;
  loadAngleDeg: number;
  assumption: HAssumptionBody;
  exactValue: number;
  r: number | null;
  computedAt: number;
}

export interface DerivedHEstimateDto {
  runId: number;
  code: string;
  neckAngleDeg: number | null;
  neckAngleFrom: string | null;
  angleDeg: number | null;
  H: number | null;
  r: number | null;
  /** Why there is no value (no angle yet, inadmissible angle, value typed by hand, run excluded). */
  reason: string | null;
}

export interface DerivedHResultDto {
  calcVersion: string;
  method: string;
  loadAngleDeg: number;
  assumptions: string[];
  cautions: string[];
  estimates: DerivedHEstimateDto[];
}

export interface CalcRunValue {
  text: string;
  value: number;
  provenance: AngleProvenance | DerivedHProvenance | null;
}

export interface CalcRunSummary {
  runId: number;
  code: string;
  version: number;
  excluded: boolean;
  settings: Record<string, string>;
  values: Record<string, CalcRunValue>;
}

export interface CalcStudyOverview {
  studyId: number;
  orientationDeg: number | null;
  responses: { id: number; symbol: string; name: string; unit: string; decimals: number; derivation: Record<string, unknown> | null }[];
  factors: { symbol: string; name: string; unit: string; kind: 'numeric' | 'categorical'; tracksMeasured: boolean }[];
  runs: CalcRunSummary[];
  canEdit: boolean;
}
