import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { AnalysisDetail, CommentBody, CommentItem, CommentThread, ReviewRequestItem } from '../../../shared/analysis';
import { ERRORS_SHOWN_INLINE } from '../core/api-error';

/** Forms that show the server's message beside themselves. */
const INLINE = { context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) };

/** Review requests, comments and sign-off (docs/api-analysis.md, "Review"). */
@Injectable({ providedIn: 'root' })
export class ReviewApi {
  private readonly http = inject(HttpClient);

  requestReview(analysisId: number, reviewerIds: number[], message: string): Observable<{ reviewRequests: ReviewRequestItem[]; mailed: number }> {
    return this.http.post<{ reviewRequests: ReviewRequestItem[]; mailed: number }>(`/api/analyses/${analysisId}/review-requests`, { reviewerIds, message }, INLINE);
  }

  threads(analysisId: number): Observable<CommentThread[]> {
    return this.http.get<{ threads: CommentThread[] }>(`/api/analyses/${analysisId}/comments`).pipe(map((r) => r.threads));
  }

  addComment(analysisId: number, body: CommentBody): Observable<CommentItem> {
    return this.http.post<{ comment: CommentItem }>(`/api/analyses/${analysisId}/comments`, body, INLINE).pipe(map((r) => r.comment));
  }

  resolve(analysisId: number, commentId: number, resolved: boolean): Observable<CommentThread> {
    return this.http.post<{ thread: CommentThread }>(`/api/analyses/${analysisId}/comments/${commentId}/resolve`, { resolved }).pipe(map((r) => r.thread));
  }

  approve(analysisId: number, note: string): Observable<AnalysisDetail> {
    return this.http.post<{ analysis: AnalysisDetail }>(`/api/analyses/${analysisId}/approve`, note ? { note } : {}, INLINE).pipe(map((r) => r.analysis));
  }

  returnForRework(analysisId: number, reason: string): Observable<AnalysisDetail> {
    return this.http.post<{ analysis: AnalysisDetail }>(`/api/analyses/${analysisId}/return`, { reason }, INLINE).pipe(map((r) => r.analysis));
  }
}
