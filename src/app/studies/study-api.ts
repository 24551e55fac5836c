import { HttpClient, HttpContext, HttpEvent, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, catchError, map, of } from 'rxjs';
import type { OperationProgress } from '../../../shared/operations';
import type { StudyRole } from '../../../shared/roles';
import { decodeRunColumns, type RunColumns } from '../../../shared/run-sheet';
import type { PlanBody, RunBatchBody, RunEdit, RunPatchBody } from '../../../shared/runs';
import type { FactorInput, OutcomesBody, ResponseInput, StudyCreateBody, StudyListQuery, StudyPatchBody } from '../../../shared/studies';
import { ERRORS_SHOWN_INLINE } from '../core/api-error';
import type {
  Attachment,
  AuditEvent,
  Factor,
  ImportPreview,
  Member,
  Outcome,
  Plan,
  PlanPreview,
  Response,
  Run,
  RunSheet,
  StudyDetail,
  StudySummary,
} from './study-types';

/** Callers that show the failure in place (a form note, a conflict marker) pass this, so no snack bar doubles it. */
export const inline = () => ({ context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) });

export interface BatchResult {
  runs: Run[];
  warnings: string[];
  undo: { edits: RunEdit[] };
}

/** The studies API (docs/api-studies.md), one method per call; components never build URLs themselves. */
@Injectable({ providedIn: 'root' })
export class StudyApi {
  private readonly http = inject(HttpClient);
  private readonly base = '/api/studies';

  list(query: Partial<StudyListQuery>): Observable<StudySummary[]> {
    let params = new HttpParams();
    for (const [key, value] of Object.entries(query)) {
      if (value !== undefined && value !== '') params = params.set(key, String(value));
    }
    return this.http.get<{ studies: StudySummary[] }>(this.base, { params }).pipe(map((r) => r.studies));
  }

  create(body: StudyCreateBody): Observable<StudyDetail> {
    return this.http.post<{ study: StudyDetail }>(this.base, body, inline()).pipe(map((r) => r.study));
  }

  patch(id: number, body: StudyPatchBody): Observable<StudyDetail> {
    return this.http.patch<{ study: StudyDetail }>(`${this.base}/${id}`, body, inline()).pipe(map((r) => r.study));
  }

  candidates(id: number): Observable<{ id: number; name: string; email: string; role: string }[]> {
    return this.http.get<{ users: { id: number; name: string; email: string; role: string }[] }>(`${this.base}/${id}/member-candidates`).pipe(map((r) => r.users));
  }

  addMember(id: number, userId: number, role: StudyRole): Observable<Member[]> {
    return this.http.post<{ members: Member[] }>(`${this.base}/${id}/members`, { userId, role }).pipe(map((r) => r.members));
  }

  removeMember(id: number, userId: number): Observable<Member[]> {
    return this.http.delete<{ members: Member[] }>(`${this.base}/${id}/members`, { params: { userId } }).pipe(map((r) => r.members));
  }

  putFactors(id: number, factors: FactorInput[]): Observable<Factor[]> {
    return this.http.put<{ factors: Factor[] }>(`${this.base}/${id}/factors`, { factors }, inline()).pipe(map((r) => r.factors));
  }

  putResponses(id: number, responses: ResponseInput[]): Observable<Response[]> {
    return this.http.put<{ responses: Response[] }>(`${this.base}/${id}/responses`, { responses }, inline()).pipe(map((r) => r.responses));
  }

  putOutcomes(id: number, outcomes: OutcomesBody['outcomes']): Observable<Outcome[]> {
    return this.http.put<{ outcomes: Outcome[] }>(`${this.base}/${id}/outcomes`, { outcomes }, inline()).pipe(map((r) => r.outcomes));
  }

  previewPlan(id: number, body: PlanBody): Observable<PlanPreview> {
    return this.http.post<{ preview: PlanPreview }>(`${this.base}/${id}/plan/preview`, body, inline()).pipe(map((r) => r.preview));
  }

  commitPlan(id: number, body: PlanBody): Observable<{ plan: Plan; runCount: number }> {
    return this.http.post<{ plan: Plan; runCount: number }>(`${this.base}/${id}/plan`, body, inline());
  }

  /** The sheet in column layout (about half the bytes of the row layout for big studies), turned back into rows. */
  runs(id: number, includeRemoved: boolean): Observable<RunSheet> {
    const params: Record<string, string> = includeRemoved ? { includeRemoved: '1', layout: 'columns' } : { layout: 'columns' };
    return this.http
      .get<Omit<RunSheet, 'runs'> & { runs: RunColumns }>(`${this.base}/${id}/runs`, { params })
      .pipe(map((sheet) => ({ ...sheet, runs: decodeRunColumns(sheet.runs) })));
  }

  patchRun(id: number, runId: number, body: RunPatchBody): Observable<{ run: Run; warnings: string[] }> {
    return this.http.patch<{ run: Run; warnings: string[] }>(`${this.base}/${id}/runs/${runId}`, body, inline());
  }

  batch(id: number, body: RunBatchBody): Observable<BatchResult> {
    return this.http.post<BatchResult>(`${this.base}/${id}/runs/batch`, body, inline());
  }

  removeRun(id: number, runId: number, reason: string, version: number): Observable<Run> {
    return this.http.delete<{ run: Run }>(`${this.base}/${id}/runs/${runId}`, { body: { reason, version }, ...inline() }).pipe(map((r) => r.run));
  }

  restoreRun(id: number, runId: number, reason: string): Observable<Run> {
    return this.http.post<{ run: Run }>(`${this.base}/${id}/runs/${runId}/restore`, { reason }, inline()).pipe(map((r) => r.run));
  }

  runHistory(id: number, runId: number): Observable<AuditEvent[]> {
    return this.http.get<{ events: AuditEvent[] }>(`${this.base}/${id}/runs/${runId}/history`).pipe(map((r) => r.events));
  }

  attachments(id: number, runId: number): Observable<Attachment[]> {
    return this.http.get<{ attachments: Attachment[] }>(`${this.base}/${id}/runs/${runId}/attachments`).pipe(map((r) => r.attachments));
  }

  /** Upload with progress events, so the dialog can show how far a large FE result file has got. */
  uploadAttachment(id: number, runId: number, file: File, kind: string): Observable<HttpEvent<{ attachment: Attachment }>> {
    const form = new FormData();
    form.append('kind', kind);
    form.append('file', file, file.name);
    return this.http.post<{ attachment: Attachment }>(`${this.base}/${id}/runs/${runId}/attachments`, form, {
      reportProgress: true,
      observe: 'events',
      ...inline(),
    });
  }

  deleteAttachment(id: number, attachmentId: number, reason: string): Observable<Attachment> {
    return this.http.delete<{ attachment: Attachment }>(`${this.base}/${id}/attachments/${attachmentId}`, { body: { reason }, ...inline() }).pipe(map((r) => r.attachment));
  }

  attachmentUrl(id: number, attachmentId: number): string {
    return `${this.base}/${id}/attachments/${attachmentId}/download`;
  }

  exportUrl(id: number, format: 'csv' | 'xlsx' | 'html'): string {
    return `${this.base}/${id}/export?format=${format}`;
  }

  uploadImport(id: number, file: File, operationId: string): Observable<HttpEvent<{ import: ImportPreview }>> {
    const form = new FormData();
    form.append('file', file, file.name);
    return this.http.post<{ import: ImportPreview }>(`${this.base}/${id}/imports`, form, {
      reportProgress: true,
      observe: 'events',
      headers: { 'X-Operation-Id': operationId },
      ...inline(),
    });
  }

  remapImport(id: number, importId: number, columns: Record<string, string>): Observable<ImportPreview> {
    return this.http.put<{ import: ImportPreview }>(`${this.base}/${id}/imports/${importId}/mapping`, { columns }, inline()).pipe(map((r) => r.import));
  }

  commitImport(id: number, importId: number, operationId: string): Observable<{ import: ImportPreview; changed: { runs: number; values: number } }> {
    return this.http.post<{ import: ImportPreview; changed: { runs: number; values: number } }>(`${this.base}/${id}/imports/${importId}/commit`, null, {
      headers: { 'X-Operation-Id': operationId },
      ...inline(),
    });
  }

  discardImport(id: number, importId: number): Observable<ImportPreview> {
    return this.http.delete<{ import: ImportPreview }>(`${this.base}/${id}/imports/${importId}`).pipe(map((r) => r.import));
  }

  /** Progress of a long server operation; null while the server has not registered it (or never does). */
  operation(operationId: string): Observable<OperationProgress | null> {
    return this.http.get<{ operation: OperationProgress }>(`/api/operations/${operationId}`, inline()).pipe(
      map((r) => r.operation),
      // Expected: 404 before the server starts tracking the operation; the bar stays indeterminate.
      catchError(() => of(null)),
    );
  }

  audit(id: number, filters: Record<string, string | number | undefined>): Observable<{ events: AuditEvent[]; total: number }> {
    return this.http.get<{ events: AuditEvent[]; total: number }>(`${this.base}/${id}/audit`, { params: clean(filters) });
  }

  auditCsvUrl(id: number, filters: Record<string, string | number | undefined>): string {
    const params = new HttpParams({ fromObject: { ...clean(filters), format: 'csv' } });
    return `${this.base}/${id}/audit?${params.toString()}`;
  }
}

function clean(filters: Record<string, string | number | undefined>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(filters)) if (v !== undefined && v !== '') out[k] = String(v);
  return out;
}
