import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { ApiError } from '../core/api-error';
import { showServerErrors } from '../core/form-errors';
import { StudyApi } from './study-api';
import { StudyFields } from './study-fields';
import { studyBody, studyForm } from './study-form';
import type { StudyDetail } from './study-types';

@Component({
  selector: 'sm-study-create-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatDialogModule, MatButtonModule, MatIconModule, StudyFields],
  template: `
    <h2 mat-dialog-title>New study</h2>
    <form (ngSubmit)="create()" [formGroup]="form">
      <mat-dialog-content>
        <p class="lead">Describe what is tested. Factors, responses and the plan come next, in Set-up and Plan.</p>
        @if (error(); as e) {
          <div class="sm-note sm-note-error" role="alert" data-testid="form-error"><mat-icon>error</mat-icon>{{ e }}</div>
        }
        <sm-study-fields [form]="form" />
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Cancel</button>
        <button mat-flat-button type="submit" [disabled]="busy()">Create study</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .lead {
      margin-top: 0;
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class StudyCreateDialog {
  private readonly api = inject(StudyApi);
  private readonly ref = inject<MatDialogRef<StudyCreateDialog, StudyDetail>>(MatDialogRef);
  protected readonly form = studyForm();
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected create(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid) return;
    this.busy.set(true);
    this.error.set(null);
    this.api.create(studyBody(this.form)).subscribe({
      next: (study) => this.ref.close(study),
      error: (e: unknown) => {
        this.busy.set(false);
        if (e instanceof ApiError && !showServerErrors(this.form, e)) this.error.set(e.message);
      },
    });
  }
}
