import { DatePipe } from '@angular/common';
import { HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTooltipModule } from '@angular/material/tooltip';
import { ApiError } from '../core/api-error';
import { ReasonDialog, type ReasonDialogData } from '../studies/reason-dialog';
import { StudyApi } from '../studies/study-api';
import type { Attachment, Run } from '../studies/study-types';
import { fileSize } from './file-size';

export interface AttachmentsDialogData {
  studyId: number;
  run: Run;
  canEdit: boolean;
}

const KINDS = [
  { value: 'fe-output', label: 'FE output' },
  { value: 'dic-export', label: 'Image-correlation export' },
  { value: 'photo', label: 'Photo' },
  { value: 'raw', label: 'Raw test data' },
  { value: 'other', label: 'Other' },
];

/** Files of one run: upload with progress, list with checksums, download, delete with a reason. */
@Component({
  selector: 'sm-attachments-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, ReactiveFormsModule, MatButtonModule, MatDialogModule, MatFormFieldModule, MatIconModule, MatProgressBarModule, MatSelectModule, MatTooltipModule],
  templateUrl: './attachments-dialog.html',
  styleUrl: './attachments-dialog.scss',
})
export class AttachmentsDialog {
  protected readonly data = inject<AttachmentsDialogData>(MAT_DIALOG_DATA);
  private readonly api = inject(StudyApi);
  private readonly dialog = inject(MatDialog);
  protected readonly kinds = KINDS;
  protected readonly kind = new FormControl('raw', { nonNullable: true });
  protected readonly progress = signal<number | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly size = fileSize;
  protected readonly list = rxResource({
    params: () => ({ id: this.data.studyId, runId: this.data.run.id }),
    stream: ({ params }) => this.api.attachments(params.id, params.runId),
  });

  protected files(): Attachment[] {
    return this.list.hasValue() ? this.list.value() : [];
  }

  protected url(a: Attachment): string {
    return this.api.attachmentUrl(this.data.studyId, a.id);
  }

  protected upload(input: HTMLInputElement): void {
    const file = input.files?.[0];
    if (!file) return;
    this.error.set(null);
    this.progress.set(0);
    this.api.uploadAttachment(this.data.studyId, this.data.run.id, file, this.kind.value).subscribe({
      next: (event) => {
        if (event.type === HttpEventType.UploadProgress) this.progress.set(event.total ? Math.round((100 * event.loaded) / event.total) : 0);
        if (event.type === HttpEventType.Response) {
          this.progress.set(null);
          input.value = '';
          this.list.reload();
        }
      },
      error: (e: unknown) => {
        this.progress.set(null);
        input.value = '';
        this.error.set(e instanceof ApiError ? e.message : 'The upload failed.');
      },
    });
  }

  protected remove(a: Attachment): void {
    const data: ReasonDialogData = {
      title: `Delete ${a.fileName}`,
      message: 'The file is removed from the server; its name, checksum and your reason stay in the record.',
      action: 'Delete file',
      destructive: true,
      required: true,
    };
    this.dialog
      .open<ReasonDialog, ReasonDialogData, string>(ReasonDialog, { data, width: '480px' })
      .afterClosed()
      .subscribe((reason) => {
        if (!reason) return;
        this.api.deleteAttachment(this.data.studyId, a.id, reason).subscribe({
          next: () => this.list.reload(),
          error: (e: unknown) => this.error.set(e instanceof ApiError ? e.message : 'The file could not be deleted.'),
        });
      });
  }
}
