import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type {
  AnalysisDetail,
  AnalysisSpecInput,
  AnalysisSummaryItem,
  PreviewResponse,
  RecommendationBody,
  RecommendationItem,
} from '../../../shared/analysis';
import type { StudyRole } from '../../../shared/roles';
import { ERRORS_SHOWN_INLINE } from '../core/api-error';

/**
 * The part of GET /api/studies/:id the analysis pages read (docs/api-studies.md, StudyDetail).
 * shared/studies.ts has no response interface for it, so the fields used here are written out.
 */
export interface StudyForAnalysis {
  id: number;
  title: string;
  status: string;
  materialGrade: string | null;
  owner: { id: number; name: string };
  myRole: StudyRole | 'admin';
  factors: { id: number; name: string; symbol: string; unit: string | null; kind: 'numeric' | 'categorical'; levels: { value: string; label?: string }[] }[];
  responses: { id: number; name: string; symbol: string; unit: string | null; goal: string; target: number | null }[];
  members: { userId: number; name: string; email: string; accountRole: string; role: StudyRole }[];
}

/** One run as GET /api/studies/:id/runs returns it; only the fields the box plots need. */
interface RunRow {
  code: string;
  settings: Record<string, string | number>;
}

/** Preview errors are shown beside the model form, so the interceptor must not raise a snack bar too. */
const INLINE = { context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) };

/** Calls of docs/api-analysis.md used by the workspace and the saved-analysis view. */
@Injectable({ providedIn: 'root' })
export class AnalysisApi {
  private readonly http = inject(HttpClient);

  study(studyId: number): Observable<StudyForAnalysis> {
    return this.http.get<{ study: StudyForAnalysis }>(`/api/studies/${studyId}`).pipe(map((r) => r.study));
  }

  /**
   * Plan settings per run code. A run's settings are fixed once the plan is committed (the plan cannot
   * be regenerated after results exist), so this mapping is valid for frozen analyses too.
   */
  runSettings(studyId: number): Observable<Map<string, Record<string, string>>> {
    return this.http.get<{ runs: RunRow[] }>(`/api/studies/${studyId}/runs?includeRemoved=1`).pipe(
      map((r) => new Map(r.runs.map((run) => [run.code, Object.fromEntries(Object.entries(run.settings).map(([k, v]) => [k, String(v)]))]))),
    );
  }

  preview(studyId: number, spec: AnalysisSpecInput): Observable<PreviewResponse> {
    return this.http.post<PreviewResponse>(`/api/studies/${studyId}/analyses/preview`, spec, INLINE);
  }

  save(studyId: number, spec: AnalysisSpecInput & { title?: string }): Observable<AnalysisDetail> {
    return this.http.post<{ analysis: AnalysisDetail }>(`/api/studies/${studyId}/analyses`, spec).pipe(map((r) => r.analysis));
  }

  list(studyId: number): Observable<AnalysisSummaryItem[]> {
    return this.http.get<{ analyses: AnalysisSummaryItem[] }>(`/api/studies/${studyId}/analyses`).pipe(map((r) => r.analyses));
  }

  get(analysisId: number): Observable<AnalysisDetail> {
    return this.http.get<{ analysis: AnalysisDetail }>(`/api/analyses/${analysisId}`).pipe(map((r) => r.analysis));
  }

  recommendation(studyId: number): Observable<RecommendationItem | null> {
    return this.http.get<{ recommendation: RecommendationItem | null }>(`/api/studies/${studyId}/recommendation`).pipe(map((r) => r.recommendation));
  }

  recordRecommendation(studyId: number, body: RecommendationBody): Observable<RecommendationItem> {
    return this.http.put<{ recommendation: RecommendationItem }>(`/api/studies/${studyId}/recommendation`, body, INLINE).pipe(map((r) => r.recommendation));
  }
}
