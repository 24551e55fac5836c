import { desc, eq } from 'drizzle-orm';
import {
  defaultTerms,
  TEST_NAMES,
  type AnalysisDetail,
  type AnalysisSpec,
  type AnalysisSpecParsed,
  type AnalysisStatus,
  type AnalysisSummaryItem,
  type DataChanges,
  type PreviewResponse,
  type SnapshotRow,
  type StoredResult,
} from '../../shared/analysis.js';
import type { Db } from '../db/client.js';
import { analyses, studies, users } from '../db/schema.js';
import { HttpError, notFound } from '../http-error.js';
import { analyse } from '../stats/analyse.js';
import type { DispersionGoal } from '../stats/dispersion.js';
import { by, type Actor } from './actor.js';
import { loadAnalysisData, dataHash, diffRows, type AnalysisData } from './analysis-data.js';
import { posthocFor } from './analysis-posthoc.js';
import { countsSentence, readingsFor, summaryParagraph } from './analysis-summary.js';
import { audit } from './audit.js';
import { autoAdvance } from './studies.js';

export type AnalysisRow = typeof analyses.$inferSelect;

export const TYPE_III_CAVEAT =
  'Type III sums of squares were requested: each term is tested after every other term, so a main effect is averaged over the levels of the factors it interacts with. With an interaction present, or unbalanced data and empty cells, that is rarely the question being asked; Type II (the default) tests each main effect after the other main effects only.';

/** Fills the defaults the schema leaves open (terms). */
export function completeSpec(spec: AnalysisSpecParsed): AnalysisSpec {
  return {
    response: spec.response,
    factors: spec.factors,
    terms: spec.terms ?? defaultTerms(spec.factors),
    ssType: spec.ssType,
    alpha: spec.alpha,
    excludeInvalid: spec.excludeInvalid,
    posthoc: spec.posthoc,
  };
}

/** The engine's checks and alternatives; Tukey is run per significant term (analysis-posthoc.ts). */
const ENGINE_TESTS = TEST_NAMES.filter((t) => t !== 'tukey');

/** The dispersion ranking follows the response's goal; nominal-the-best needs its target. */
function dispersionGoal(r: AnalysisData['response']): DispersionGoal {
  if (r.goal === 'nominal') return r.target === null ? { kind: 'scatter' } : { kind: 'nominal', target: r.target };
  return { kind: r.goal };
}

/** Gathers the runs, calls the engine and words the result. Writes nothing. */
export function computeAnalysis(db: Db, studyId: number, spec: AnalysisSpec): PreviewResponse & { data: AnalysisData } {
  const data = loadAnalysisData(db, studyId, spec);
  if (data.rows.length === 0) throw new HttpError(400, `No runs to analyse for response "${spec.response}": ${countsSentence(data.counts)}`);
  const result = analyse({
    rows: data.rows.map((r) => ({ factors: r.settings, value: r.value })),
    response: spec.response,
    factors: spec.factors,
    terms: spec.terms,
    ssType: spec.ssType,
    alpha: spec.alpha,
    tests: ENGINE_TESTS,
    levels: data.levels,
    dispersion: dispersionGoal(data.response),
  });
  if (data.response.goal === 'nominal' && data.response.target === null) {
    result.notes.push(`response ${data.response.symbol} is nominal-the-best but has no target: settings are ranked by scatter alone`);
  }
  if (spec.ssType === 3) result.notes.push(TYPE_III_CAVEAT);
  const { posthoc, notes } = spec.posthoc ? posthocFor(result, data.rows, data.levels, spec.alpha) : { posthoc: [], notes: ['Tukey HSD not computed in this preview (posthoc: false)'] };
  result.notes.push(...notes);
  const label = data.response.unit ? `${data.response.name} (${data.response.symbol}, ${data.response.unit})` : `${data.response.name} (${data.response.symbol})`;
  return {
    data,
    result,
    posthoc,
    counts: data.counts,
    summary: summaryParagraph(result, data.counts, spec.alpha, label),
    readings: readingsFor(result, spec.alpha, posthoc),
    rowCodes: data.rows.map((r) => r.code),
    dataHash: dataHash(studyId, spec, data.rows),
  };
}

export function previewAnalysis(db: Db, studyId: number, spec: AnalysisSpec): PreviewResponse {
  const { data: _data, ...preview } = computeAnalysis(db, studyId, spec);
  return preview;
}

export function saveAnalysis(db: Db, actor: Actor, studyId: number, requested: AnalysisSpec, title?: string): number {
  // A saved analysis is complete: its post-hoc comparisons are always computed and frozen with it.
  const spec: AnalysisSpec = { ...requested, posthoc: true };
  const computed = computeAnalysis(db, studyId, spec);
  const stored: StoredResult = { engine: computed.result, posthoc: computed.posthoc, counts: computed.counts, summary: computed.summary, readings: computed.readings, rowCodes: computed.rowCodes };
  return db.transaction((tx) => {
    const row = tx
      .insert(analyses)
      .values({
        studyId,
        title: title ?? `${spec.response} ~ ${spec.terms.join(' + ')} (Type ${['I', 'II', 'III'][spec.ssType - 1]})`,
        spec: { ...spec },
        result: stored as unknown as Record<string, unknown>,
        engineVersion: computed.result.engineVersion,
        dataHash: computed.dataHash,
        dataSnapshot: computed.data.rows as unknown as Record<string, unknown>[],
        createdBy: actor.userId,
      })
      .returning({ id: analyses.id })
      .get();
    audit(tx, { ...by(actor), studyId, entity: 'analysis', entityId: String(row.id), action: 'create', newValue: JSON.stringify({ spec, dataHash: computed.dataHash, engineVersion: computed.result.engineVersion, runsUsed: computed.counts.used }) });
    autoAdvance(tx, actor, studyId, 'collecting', 'analysed', `analysis ${row.id} saved`);
    return row.id;
  });
}

export function getAnalysisRow(db: Db, id: number): AnalysisRow {
  const row = db.select().from(analyses).where(eq(analyses.id, id)).get();
  if (!row) throw notFound('The analysis');
  return row;
}

export function specOf(row: AnalysisRow): AnalysisSpec {
  return row.spec as unknown as AnalysisSpec;
}

export function storedOf(row: AnalysisRow): StoredResult {
  return row.result as unknown as StoredResult;
}

export interface Freshness {
  currentHash: string;
  stale: boolean;
  changes: DataChanges | null;
}

/** Re-hashes today's data under the analysis's own selection and says what changed since. */
export function freshness(db: Db, row: AnalysisRow): Freshness {
  const spec = specOf(row);
  const data = loadAnalysisData(db, row.studyId, spec);
  const currentHash = dataHash(row.studyId, spec, data.rows);
  if (currentHash === row.dataHash) return { currentHash, stale: false, changes: null };
  return { currentHash, stale: true, changes: diffRows(row.dataSnapshot as unknown as SnapshotRow[], data.rows, data.notUsed) };
}

function userNames(db: Db): Map<number, string> {
  return new Map(db.select({ id: users.id, name: users.name }).from(users).all().map((u) => [u.id, u.name]));
}

function ref(names: Map<number, string>, id: number | null) {
  return id === null ? null : { id, name: names.get(id) ?? `user ${id}` };
}

export function summaryItem(row: AnalysisRow, stale: boolean, names: Map<number, string>): AnalysisSummaryItem {
  return {
    id: row.id,
    studyId: row.studyId,
    title: row.title,
    status: row.status as AnalysisStatus,
    spec: specOf(row),
    engineVersion: row.engineVersion,
    dataHash: row.dataHash,
    stale,
    createdBy: ref(names, row.createdBy)!,
    createdAt: row.createdAt,
    approvedBy: ref(names, row.approvedBy),
    approvedAt: row.approvedAt,
    returnedReason: row.returnedReason,
  };
}

/** Newest first. Analyses sharing a selection (response, factors, exclusion) share one re-hash. */
export function listAnalyses(db: Db, studyId: number): AnalysisSummaryItem[] {
  const rows = db.select().from(analyses).where(eq(analyses.studyId, studyId)).orderBy(desc(analyses.createdAt), desc(analyses.id)).all();
  const names = userNames(db);
  const hashes = new Map<string, string>();
  return rows.map((row) => {
    const spec = specOf(row);
    const key = JSON.stringify([spec.response, spec.factors, spec.excludeInvalid]);
    let hash = hashes.get(key);
    if (hash === undefined) {
      hash = dataHash(studyId, spec, loadAnalysisData(db, studyId, spec).rows);
      hashes.set(key, hash);
    }
    return summaryItem(row, hash !== row.dataHash, names);
  });
}

export function studyOfAnalysis(db: Db, analysisId: number) {
  const row = db.select({ id: studies.id, title: studies.title, status: studies.status, ownerId: studies.ownerId }).from(studies).innerJoin(analyses, eq(analyses.studyId, studies.id)).where(eq(analyses.id, analysisId)).get();
  if (!row) throw notFound('The analysis');
  return row;
}

export function analysisLink(studyId: number, analysisId: number): string {
  return `/studies/${studyId}/analyses/${analysisId}`;
}

export type DetailExtras = Pick<AnalysisDetail, 'reviewRequests' | 'can'>;

/** The full view: stored result, today's freshness, and what the caller may do (filled by the caller). */
export function analysisDetail(db: Db, row: AnalysisRow, fresh: Freshness, extras: DetailExtras): AnalysisDetail {
  const stored = storedOf(row);
  const names = userNames(db);
  return {
    ...summaryItem(row, fresh.stale, names),
    result: stored.engine,
    posthoc: stored.posthoc ?? [],
    counts: stored.counts,
    summary: stored.summary,
    readings: stored.readings,
    rowCodes: stored.rowCodes,
    currentHash: fresh.currentHash,
    changes: fresh.changes,
    study: studyOfAnalysis(db, row.id),
    link: analysisLink(row.studyId, row.id),
    ...extras,
  };
}
