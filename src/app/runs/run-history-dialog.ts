import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { AuditTable } from '../audit/audit-table';
import { StudyApi } from '../studies/study-api';
import type { Run } from '../studies/study-types';

export interface RunHistoryData {
  studyId: number;
  run: Run;
}

/** Every recorded change to one run, newest first: who, when, old, new, why. */
@Component({
  selector: 'sm-run-history-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, MatDialogModule, MatButtonModule, MatProgressBarModule, AuditTable],
  template: `
    <h2 mat-dialog-title>History of run {{ data.run.code }}</h2>
    <mat-dialog-content>
      <p class="sub">Last changed {{ data.run.updatedAt | date: 'd MMM y, HH:mm' }} · version {{ data.run.version }}</p>
      @if (history.isLoading()) {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the history" />
      } @else if (history.hasValue()) {
        <sm-audit-table [events]="history.value()" [showRun]="false" data-testid="run-history" />
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end"><button mat-button mat-dialog-close>Close</button></mat-dialog-actions>
  `,
  styles: `
    .sub {
      color: var(--mat-sys-on-surface-variant);
      margin-top: 0;
    }
  `,
})
export class RunHistoryDialog {
  protected readonly data = inject<RunHistoryData>(MAT_DIALOG_DATA);
  private readonly api = inject(StudyApi);
  protected readonly history = rxResource({
    params: () => ({ id: this.data.studyId, runId: this.data.run.id }),
    stream: ({ params }) => this.api.runHistory(params.id, params.runId),
  });
}
