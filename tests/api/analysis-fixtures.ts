import { readFileSync } from 'node:fs';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import type { AppContext } from '../../server/context.js';
import { analyses, factors, outcomes, responses, runs, runValues, studies, studyMembers, users } from '../../server/db/schema.js';
import { dataHash } from '../../server/services/analysis-data.js';
import { readingsFor } from '../../server/services/analysis-summary.js';
import { analyse } from '../../server/stats/analyse.js';
import { DEFAULT_OUTCOMES } from '../../shared/studies.js';
import type { StudyRole } from '../../shared/roles.js';
import { DEMO_EMAIL } from './harness.js';

/**
 * Builds analysis test studies straight in the database (study, members, factors, responses,
 * default outcomes, runs with values), so the analysis tests do not depend on the plan and import
 * flows. Run edits in the tests go through the real run-sheet API.
 */

export interface FixtureRun {
  settings: Record<string, string>;
  values: Record<string, string>;
  outcome?: string;
  removed?: boolean;
}

export interface FixtureStudy {
  title: string;
  factors: { symbol: string; name?: string; unit?: string; kind?: 'numeric' | 'categorical'; levels: string[] }[];
  responses: { symbol: string; name?: string; unit?: string }[];
  runs: FixtureRun[];
  /** extra members by demo account role; the engineer is always the owner */
  members?: { email: string; role: StudyRole }[];
  status?: 'collecting' | 'analysed';
}

export function userId(ctx: AppContext, email: string): number {
  return ctx.db.select({ id: users.id }).from(users).where(eq(users.email, email)).get()!.id;
}

export function insertStudy(ctx: AppContext, s: FixtureStudy): { studyId: number; runIds: number[] } {
  return ctx.db.transaction((tx) => {
    const ownerId = tx.select({ id: users.id }).from(users).where(eq(users.email, DEMO_EMAIL.engineer)).get()!.id;
    const study = tx.insert(studies).values({ title: s.title, ownerId, status: s.status ?? 'collecting', materialGrade: 'invented grade TX-1', specimenFamily: 'notched strip', thicknessMm: 1.2 }).returning().get();
    tx.insert(studyMembers).values({ studyId: study.id, userId: ownerId, role: 'owner' }).run();
    for (const m of s.members ?? []) {
      const uid = tx.select({ id: users.id }).from(users).where(eq(users.email, m.email)).get()!.id;
      tx.insert(studyMembers).values({ studyId: study.id, userId: uid, role: m.role }).run();
    }
    const outs = tx.insert(outcomes).values(DEFAULT_OUTCOMES.map((o, i) => ({ ...o, studyId: study.id, position: i }))).returning().all();
    s.factors.forEach((f, i) =>
      tx.insert(factors).values({ studyId: study.id, position: i, name: f.name ?? f.symbol, symbol: f.symbol, unit: f.unit ?? '', kind: f.kind ?? 'categorical', levels: f.levels.map((value) => ({ value })) }).run(),
    );
    const resp = s.responses.map((r, i) => tx.insert(responses).values({ studyId: study.id, position: i, name: r.name ?? r.symbol, symbol: r.symbol, unit: r.unit ?? '', goal: 'nominal' }).returning().get());
    const runIds: number[] = [];
    s.runs.forEach((r, i) => {
      const outcome = r.outcome === undefined ? null : outs.find((o) => o.label === r.outcome)!.id;
      const run = tx
        .insert(runs)
        .values({ studyId: study.id, code: `R${String(i + 1).padStart(4, '0')}`, standardOrder: i + 1, runOrder: i + 1, settings: r.settings, outcomeId: outcome, removedAt: r.removed ? Date.now() : null, removedReason: r.removed ? 'fixture' : null })
        .returning({ id: runs.id })
        .get();
      runIds.push(run.id);
      for (const [sym, text] of Object.entries(r.values)) {
        const rr = resp.find((x) => x.symbol === sym)!;
        tx.insert(runValues).values({ runId: run.id, responseId: rr.id, text, value: Number(text) }).run();
      }
    });
    return { studyId: study.id, runIds };
  });
}

export interface Warpbreaks {
  rows: [number, string, string][];
  twoWay: { table: { term: string; df: number; ss: number; ms: number; f: number | null; p: number | null }[]; partialEtaSquared: { term: string; value: number }[] };
  shapiroResidualsTwoWay: { W: number; p: number };
  leveneMeanCells: { f: number; p: number; df1: number; df2: number };
  cellSummary: { level: string; n: number; mean: number; sd: number; median: number }[];
  tukeyHSDTwoWay: { terms: Record<string, { comparison: string; diff: number; lwr: number; upr: number; pAdj: number }[]> };
}

/** R's warpbreaks data and results (shared/reference/r-datasets/warpbreaks.json, R 4.2.2). */
export function warpbreaks(): Warpbreaks {
  const raw = JSON.parse(readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/warpbreaks.json'), 'utf8')) as {
    data: { rows: [number, string, string][] };
  } & Omit<Warpbreaks, 'rows'>;
  return { rows: raw.data.rows, twoWay: raw.twoWay, shapiroResidualsTwoWay: raw.shapiroResidualsTwoWay, leveneMeanCells: raw.leveneMeanCells, tukeyHSDTwoWay: raw.tukeyHSDTwoWay, cellSummary: raw.cellSummary };
}

/** warpbreaks as a study: factors W (wool A/B) and T (tension L/M/H), response breaks; all runs valid. */
export function warpbreaksStudy(members: FixtureStudy['members'] = []): FixtureStudy {
  return {
    title: 'Warp breaks (R datasets) as a study',
    factors: [
      { symbol: 'W', name: 'wool', levels: ['A', 'B'] },
      { symbol: 'T', name: 'tension', levels: ['L', 'M', 'H'] },
    ],
    responses: [{ symbol: 'breaks', name: 'breaks per loom' }],
    runs: warpbreaks().rows.map(([breaks, wool, tension]) => ({ settings: { W: wool, T: tension }, values: { breaks: String(breaks) }, outcome: 'valid' })),
    members,
  };
}

/** Relative difference, for comparisons with reference values. */
export function rel(a: number, b: number): number {
  return Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
}

/**
 * A saved analysis for the access-policy walk: a real stored result (the engine run on a small
 * invented 2 x 3 layout) over an empty selection of the walk study, so every analysis route —
 * view, report, review, sign-off — has something valid to act on.
 */
export function insertWalkAnalysis(ctx: AppContext, studyId: number, createdBy: number, id?: number): number {
  const spec = { response: 'H', factors: ['A', 'B'], terms: ['A', 'B', 'A:B'], ssType: 2 as const, alpha: 0.05, excludeInvalid: true, posthoc: true };
  const rows = ['0.5', '0.8'].flatMap((a, i) => ['round', 'vee', 'flat'].flatMap((b, j) => [0, 1].map((r) => ({ factors: { A: a, B: b }, value: String(0.4 + 0.1 * i + 0.05 * j + 0.01 * r) }))));
  const engine = analyse({ rows, response: 'H', factors: ['A', 'B'], terms: spec.terms, tests: ['shapiro', 'levene'] });
  const counts = { total: 0, used: 0, removed: 0, centrePoints: 0, excludedInvalid: 0, byReason: [], invalidIncluded: 0, missingValue: 0 };
  const stored = { engine, posthoc: [], counts, summary: 'walk fixture', readings: readingsFor(engine, 0.05), rowCodes: rows.map((_, i) => `W${i + 1}`) };
  const row = ctx.db
    .insert(analyses)
    .values({ ...(id === undefined ? {} : { id }), studyId, title: 'Walk analysis', spec, result: stored as unknown as Record<string, unknown>, engineVersion: engine.engineVersion, dataHash: dataHash(studyId, spec, []), dataSnapshot: [], createdBy })
    .returning({ id: analyses.id })
    .get();
  return row.id;
}
