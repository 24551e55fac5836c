import { desc, eq } from 'drizzle-orm';
import type { RecommendationBody, RecommendationItem } from '../../shared/analysis.js';
import type { Db } from '../db/client.js';
import { recommendations, users } from '../db/schema.js';
import { HttpError } from '../http-error.js';
import { by, type Actor } from './actor.js';
import { analysisLink, freshness, getAnalysisRow } from './analysis.js';
import { audit } from './audit.js';
import { loadSetup } from './study-setup.js';

/**
 * The study's recommended geometry: chosen factor levels with tolerance windows and a rationale,
 * recorded only from an approved analysis whose data are unchanged, and linked back to it. Each
 * record is kept; the newest is the current recommendation.
 */

type RecRow = typeof recommendations.$inferSelect;
type StoredSetting = RecommendationItem['settings'][number];

const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function checkSettings(db: Db, studyId: number, body: RecommendationBody): StoredSetting[] {
  const { factors } = loadSetup(db, studyId);
  const seen = new Set<string>();
  return body.settings.map((s, i) => {
    const bad = (field: string, message: string) => new HttpError(400, `settings.${i}.${field}: ${message}`, { details: [{ path: `settings.${i}.${field}`, message }] });
    const f = factors.find((x) => x.symbol === s.factor);
    if (!f) throw bad('factor', `"${s.factor}" is not a factor of this study (known: ${factors.map((x) => x.symbol).join(', ')})`);
    if (seen.has(f.symbol)) throw bad('factor', `"${s.factor}" is given twice`);
    seen.add(f.symbol);
    const levels = f.levels.map((l) => l.value);
    if (f.kind === 'categorical') {
      if (!levels.includes(s.level)) throw bad('level', `"${s.level}" is not a level of ${f.symbol} (levels: ${levels.join(', ')})`);
      if (s.toleranceMinus !== undefined || s.tolerancePlus !== undefined) throw bad('toleranceMinus', `${f.symbol} is categorical; tolerances apply to numeric factors only`);
    } else {
      if (!DECIMAL.test(s.level)) throw bad('level', `"${s.level}" is not a number (use a point as decimal mark)`);
      const v = Number(s.level);
      const nums = levels.map(Number);
      const lo = Math.min(...nums);
      const hi = Math.max(...nums);
      // Outside the studied range the analysis says nothing: extrapolation is refused, not flagged.
      if (v < lo || v > hi) throw bad('level', `${s.level} lies outside the studied range of ${f.symbol} (${lo} to ${hi} ${f.unit})`.trim());
    }
    return { factor: f.symbol, level: s.level, toleranceMinus: s.toleranceMinus, tolerancePlus: s.tolerancePlus, unit: f.unit };
  });
}

function toItem(db: Db, row: RecRow): RecommendationItem {
  const user = db.select({ id: users.id, name: users.name }).from(users).where(eq(users.id, row.createdBy)).get();
  const analysis = getAnalysisRow(db, row.analysisId);
  return {
    id: row.id,
    studyId: row.studyId,
    analysisId: row.analysisId,
    settings: row.settings as unknown as StoredSetting[],
    rationale: row.rationale,
    createdBy: user ?? { id: row.createdBy, name: `user ${row.createdBy}` },
    createdAt: row.createdAt,
    analysisLink: analysisLink(row.studyId, row.analysisId),
    stale: freshness(db, analysis).stale,
  };
}

export function putRecommendation(db: Db, actor: Actor, studyId: number, body: RecommendationBody): RecommendationItem {
  const analysis = getAnalysisRow(db, body.analysisId);
  if (analysis.studyId !== studyId) throw new HttpError(400, `analysisId ${body.analysisId} is not an analysis of this study`, { details: [{ path: 'analysisId', message: 'Another study\'s analysis' }] });
  if (analysis.status !== 'approved') throw new HttpError(409, `Analysis ${analysis.id} is ${analysis.status.replace('_', ' ')}; a recommendation rests on an approved analysis`);
  const fresh = freshness(db, analysis);
  if (fresh.stale) throw new HttpError(409, `The data of analysis ${analysis.id} have changed since its approval; save, review and approve a new analysis before recommending`, { current: { changes: fresh.changes } });
  const settings = checkSettings(db, studyId, body);
  const row = db.transaction((tx) => {
    const inserted = tx.insert(recommendations).values({ studyId, analysisId: analysis.id, settings: settings as unknown as Record<string, unknown>[], rationale: body.rationale, createdBy: actor.userId }).returning().get();
    audit(tx, { ...by(actor), studyId, entity: 'recommendation', entityId: String(inserted.id), action: 'create', newValue: JSON.stringify({ analysisId: analysis.id, settings }), reason: body.rationale });
    return inserted;
  });
  return toItem(db, row);
}

export function currentRecommendation(db: Db, studyId: number): RecommendationItem | null {
  const row = db.select().from(recommendations).where(eq(recommendations.studyId, studyId)).orderBy(desc(recommendations.createdAt), desc(recommendations.id)).limit(1).get();
  return row ? toItem(db, row) : null;
}
