import { eq } from 'drizzle-orm';
import type { AnalysisResult, PosthocTerm, Readings, RunCounts, SnapshotRow } from '../../shared/analysis.js';
import type { Db } from '../db/client.js';
import { studies, users } from '../db/schema.js';
import { buildCharts, type ChartSpec } from '../report/charts/index.js';
import { renderReportHtml } from '../report/html.js';
import { renderReportPdf } from '../report/pdf.js';
import { renderSvg } from '../report/render-svg.js';
import { analysisLink, freshness, specOf, storedOf, type AnalysisRow } from './analysis.js';
import { CAUTION_SENTENCE } from './analysis-summary.js';
import { listReviewRequests } from './review.js';
import { loadSetup } from './study-setup.js';

/**
 * Everything the report shows, gathered once and handed to the HTML and PDF renderers, which only
 * lay it out. The report is built from the frozen analysis (result, snapshot, hash), never from
 * today's run sheet; today's data are consulted only to say whether the analysis is stale.
 */

export interface ReportModel {
  generatedAt: number;
  draft: boolean;
  stale: boolean;
  analysis: { id: number; title: string; status: string; engineVersion: string; dataHash: string; currentHash: string; createdAt: number; createdBy: string; link: string };
  study: {
    id: number; title: string; purpose: string; specimenFamily: string; materialDescription: string; materialGrade: string;
    batch: string; thicknessMm: number | null; orientationDeg: number | null; owner: string; status: string;
  };
  design: {
    factors: { symbol: string; name: string; unit: string; kind: string; levels: string[] }[];
    response: { symbol: string; name: string; unit: string };
    terms: string[];
    ssType: number;
    alpha: number;
    excludeInvalid: boolean;
  };
  counts: RunCounts;
  result: AnalysisResult;
  posthoc: PosthocTerm[];
  summary: string;
  readings: Readings;
  reviewers: { name: string; role: string; requestedAt: number; requestedBy: string }[];
  approval: { by: string; at: number } | null;
  returnedReason: string | null;
  charts: (ChartSpec & { svg: string })[];
  cautions: string[];
}

export function buildReportModel(db: Db, row: AnalysisRow, withCharts = true): ReportModel {
  const spec = specOf(row);
  const stored = storedOf(row);
  const setup = loadSetup(db, row.studyId);
  const study = db.select().from(studies).where(eq(studies.id, row.studyId)).get()!;
  const name = (id: number | null) => (id === null ? '' : (db.select({ name: users.name }).from(users).where(eq(users.id, id)).get()?.name ?? `user ${id}`));
  const fresh = freshness(db, row);
  const snapshot = row.dataSnapshot as unknown as SnapshotRow[];
  const chosen = spec.factors.map((sym) => setup.factors.find((f) => f.symbol === sym));
  const levels: Record<string, string[]> = {};
  spec.factors.forEach((sym, i) => {
    const seen = new Set(snapshot.map((r) => r.settings[sym]));
    const order = chosen[i]?.levels.map((l) => l.value) ?? [];
    levels[sym] = [...order.filter((l) => seen.has(l)), ...[...seen].filter((l): l is string => l !== undefined && !order.includes(l))];
  });
  const response = setup.responses.find((r) => r.symbol === spec.response);
  const charts = withCharts
    ? buildCharts({ result: stored.engine, terms: spec.terms, runs: snapshot, levels }).map((c) => ({ ...c, svg: renderSvg(c.option) }))
    : [];
  return {
    generatedAt: Date.now(),
    draft: row.status !== 'approved',
    stale: fresh.stale,
    analysis: { id: row.id, title: row.title, status: row.status, engineVersion: row.engineVersion, dataHash: row.dataHash, currentHash: fresh.currentHash, createdAt: row.createdAt, createdBy: name(row.createdBy), link: analysisLink(row.studyId, row.id) },
    study: {
      id: study.id, title: study.title, purpose: study.purpose, specimenFamily: study.specimenFamily, materialDescription: study.materialDescription,
      materialGrade: study.materialGrade, batch: study.batch, thicknessMm: study.thicknessMm, orientationDeg: study.orientationDeg, owner: name(study.ownerId), status: study.status,
    },
    design: {
      factors: spec.factors.map((sym, i) => ({ symbol: sym, name: chosen[i]?.name ?? sym, unit: chosen[i]?.unit ?? '', kind: chosen[i]?.kind ?? 'categorical', levels: chosen[i]?.levels.map((l) => l.value) ?? levels[sym] ?? [] })),
      response: { symbol: spec.response, name: response?.name ?? spec.response, unit: response?.unit ?? '' },
      terms: spec.terms,
      ssType: spec.ssType,
      alpha: spec.alpha,
      excludeInvalid: spec.excludeInvalid,
    },
    counts: stored.counts,
    result: stored.engine,
    posthoc: stored.posthoc ?? [],
    summary: stored.summary,
    readings: stored.readings,
    reviewers: listReviewRequests(db, row.id).map((r) => ({ name: r.reviewer.name, role: r.reviewer.role, requestedAt: r.createdAt, requestedBy: r.requestedBy.name })),
    approval: row.approvedBy !== null && row.approvedAt !== null ? { by: name(row.approvedBy), at: row.approvedAt } : null,
    returnedReason: row.returnedReason,
    charts,
    cautions: [...new Set([CAUTION_SENTENCE, ...stored.engine.cautions])],
  };
}

export function reportHtml(db: Db, row: AnalysisRow): string {
  return renderReportHtml(buildReportModel(db, row));
}

export function reportPdf(db: Db, row: AnalysisRow): Promise<Buffer> {
  return renderReportPdf(buildReportModel(db, row));
}
