import type { AnalysisSpec } from '../../shared/analysis.js';
import type { Db } from '../db/client.js';
import { ENGINE_VERSION } from '../stats/analyse.js';
import { previewAnalysis } from './analysis.js';
import { cachedStudyJson, type CachedJson } from './cached-json.js';

/** A 10 000-run preview serialises to ~0.2 MB (the run codes dominate): room for many specs. */
const PREVIEW_CACHE_BYTES = 16 * 2 ** 20;

/** JSON with object keys sorted at every level: equal specs give equal keys whatever their field order. */
function canonicalJson(value: unknown): string {
  const sortKeys = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(sortKeys);
    if (v === null || typeof v !== 'object') return v;
    return Object.fromEntries(Object.entries(v).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).map(([k, x]) => [k, sortKeys(x)]));
  };
  return JSON.stringify(sortKeys(value));
}

/**
 * The serialised analysis preview for this study at its current data revision and this spec. The
 * key is the whole completed spec (completeSpec has filled the defaults) in canonical JSON, plus
 * the engine version; the result does not depend on who asks. Errors (e.g. no runs to analyse)
 * are thrown before anything is stored, so they are never cached.
 */
export function cachedPreview(db: Db, studyId: number, spec: AnalysisSpec): CachedJson {
  const variant = `${ENGINE_VERSION}:${canonicalJson(spec)}`;
  return cachedStudyJson(db, 'analysis-preview', PREVIEW_CACHE_BYTES, studyId, variant, () => previewAnalysis(db, studyId, spec));
}
