import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';

export interface ReasonDialogData {
  title: string;
  /** What will happen, in one or two sentences. */
  message: string;
  action: string;
  /** Whether the action destroys or hides something (the button turns to the error colour). */
  destructive?: boolean;
  /** Reasons are audited; the server asks for at least 3 characters where one is required. */
  required: boolean;
}

/** Asks why before an audited change (removing a run, deleting a file, stepping a status back). */
@Component({
  selector: 'sm-reason-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatDialogModule, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <h2 mat-dialog-title>{{ data.title }}</h2>
    <form [formGroup]="form" (ngSubmit)="confirm()">
      <mat-dialog-content>
        <p>{{ data.message }}</p>
        <mat-form-field appearance="outline" class="sm-full-width">
          <mat-label>Reason{{ data.required ? '' : ' (optional)' }}</mat-label>
          <textarea matInput [formControl]="reason" name="reason" rows="3" cdkFocusInitial></textarea>
          <mat-hint>Kept in the audit trail with your name and the time</mat-hint>
          <mat-error>Say why, in at least 3 characters</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Cancel</button>
        <button mat-flat-button type="submit" [class.destructive]="data.destructive">{{ data.action }}</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .destructive {
      --mat-button-filled-container-color: var(--mat-sys-error);
      --mat-button-filled-label-text-color: var(--mat-sys-on-error);
    }
  `,
})
export class ReasonDialog {
  protected readonly data = inject<ReasonDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<ReasonDialog, string>>(MatDialogRef);
  protected readonly reason = new FormControl('', {
    nonNullable: true,
    validators: this.data.required ? [Validators.required, (c) => (c.value.trim().length < 3 ? { short: true } : null)] : [],
  });
  // A [formGroup] gives the <form> Angular's submit handling (without one the browser would submit the page).
  protected readonly form = new FormGroup({ reason: this.reason });

  protected confirm(): void {
    this.reason.markAsTouched();
    if (this.reason.invalid) return;
    this.ref.close(this.reason.value.trim());
  }
}
