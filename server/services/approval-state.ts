import type { AnalysisSpec } from '../../shared/analysis.js';
import type { ApprovalState } from '../../shared/studies.js';
import type { Db } from '../db/client.js';
import { dataHash, loadAnalysisData } from './analysis-data.js';
import { studyRevision } from './study-revision.js';

/**
 * For approved studies: the analysis that was signed off, and whether the data it was computed from
 * have changed since (the same re-hash the saved-analyses list uses to mark an analysis stale). The
 * approval stays valid for its frozen data; this tells the reader of the study that today's sheet
 * says something else. Answers are remembered per (analysis, study data revision): the re-hash of a
 * 10 000-run study costs tens of milliseconds, and the list page asks for every approved study.
 */
const remembered = new WeakMap<Db, Map<string, boolean>>();
const REMEMBER_AT_MOST = 1000;

interface ApprovedRow {
  studyId: number;
  id: number;
  approvedAt: number;
  spec: string;
  dataHash: string;
}

export function approvalStates(db: Db, studyIds: number[]): Map<number, ApprovalState> {
  const out = new Map<number, ApprovalState>();
  if (studyIds.length === 0) return out;
  // the newest approved analysis of each study that is approved now
  const rows = db.$client
    .prepare(
      `select a.study_id as studyId, a.id, a.approved_at as approvedAt, a.spec, a.data_hash as dataHash
       from analyses a join studies s on s.id = a.study_id
       where s.status = 'approved' and a.status = 'approved' and a.study_id in (select value from json_each(?))
       order by a.approved_at desc, a.id desc`,
    )
    .all(JSON.stringify(studyIds)) as ApprovedRow[];
  let memo = remembered.get(db);
  if (!memo) remembered.set(db, (memo = new Map()));
  for (const row of rows) {
    if (out.has(row.studyId)) continue;
    const revision = studyRevision(db, row.studyId);
    const key = `${row.id}:${revision}`;
    let changed = revision === null ? undefined : memo.get(key);
    if (changed === undefined) {
      const spec = JSON.parse(row.spec) as AnalysisSpec;
      changed = dataHash(row.studyId, spec, loadAnalysisData(db, row.studyId, spec).rows) !== row.dataHash;
      if (revision !== null) {
        if (memo.size >= REMEMBER_AT_MOST) memo.delete(memo.keys().next().value!);
        memo.set(key, changed);
      }
    }
    out.set(row.studyId, { analysisId: row.id, approvedAt: row.approvedAt, dataChanged: changed });
  }
  return out;
}
