import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type {
  AngleComputeBody,
  AngleFileInfo,
  AngleResultDto,
  AngleStoreBody,
  CalcRunSummary,
  CalcStudyOverview,
  DerivedHPreviewBody,
  DerivedHResultDto,
  DerivedHStoreBody,
  HFromAngleBody,
  HFromAngleResult,
  Hill48Body,
  Hill48Result,
  NeckAngleBody,
  NeckAngleResult,
} from '../../../shared/calc';
import type { RunChange } from '../../../shared/runs';
import { ERRORS_SHOWN_INLINE } from '../core/api-error';

/** Calculator refusals belong beside the inputs they refuse: the pages show ApiError.message inline. */
const inline = () => ({ context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) });

/** Calls of the response calculator API (server/routes/calc.ts); every error arrives as ApiError. */
@Injectable({ providedIn: 'root' })
export class CalcApi {
  private readonly http = inject(HttpClient);

  hill48(body: Hill48Body): Observable<Hill48Result> {
    return this.http.post<Hill48Result>('/api/calc/hill48', body, inline());
  }

  neckAngle(body: NeckAngleBody): Observable<NeckAngleResult> {
    return this.http.post<NeckAngleResult>('/api/calc/neck-angle', body, inline());
  }

  hFromAngle(body: HFromAngleBody): Observable<HFromAngleResult> {
    return this.http.post<HFromAngleResult>('/api/calc/h-from-angle', body, inline());
  }

  overview(studyId: number): Observable<CalcStudyOverview> {
    return this.http.get<CalcStudyOverview>(`/api/studies/${studyId}/calc`);
  }

  uploadHistory(studyId: number, runId: number, file: File): Observable<{ file: AngleFileInfo }> {
    const form = new FormData();
    form.append('file', file, file.name);
    return this.http.post<{ file: AngleFileInfo }>(`/api/studies/${studyId}/runs/${runId}/angle/files`, form, inline());
  }

  historyFile(studyId: number, runId: number, attachmentId: number): Observable<{ file: AngleFileInfo }> {
    return this.http.get<{ file: AngleFileInfo }>(`/api/studies/${studyId}/runs/${runId}/angle/files/${attachmentId}`);
  }

  computeAngle(studyId: number, runId: number, body: AngleComputeBody): Observable<{ result: AngleResultDto }> {
    return this.http.post<{ result: AngleResultDto }>(`/api/studies/${studyId}/runs/${runId}/angle/compute`, body, inline());
  }

  storeAngle(studyId: number, runId: number, body: AngleStoreBody): Observable<{ run: CalcRunSummary; result: AngleResultDto; changes: RunChange[]; warnings: string[] }> {
    return this.http.post<{ run: CalcRunSummary; result: AngleResultDto; changes: RunChange[]; warnings: string[] }>(`/api/studies/${studyId}/runs/${runId}/angle/store`, body, inline());
  }

  previewDerivedH(studyId: number, body: DerivedHPreviewBody): Observable<{ result: DerivedHResultDto }> {
    return this.http.post<{ result: DerivedHResultDto }>(`/api/studies/${studyId}/calc/derived-h/preview`, body, inline());
  }

  storeDerivedH(studyId: number, body: DerivedHStoreBody): Observable<{ result: DerivedHResultDto; changes: RunChange[]; warnings: string[] }> {
    return this.http.post<{ result: DerivedHResultDto; changes: RunChange[]; warnings: string[] }>(`/api/studies/${studyId}/calc/derived-h`, body, inline());
  }
}
