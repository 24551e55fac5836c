import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import type { AnalysisDetail } from '../../../shared/analysis';
import { ApiError } from '../core/api-error';
import { ReviewApi } from './review-api';

/**
 * Approve or return, for the supervisor who may. The page shows this only when the server says the
 * caller may approve (`can.approve`); the server checks again on the call.
 */
@Component({
  selector: 'sm-sign-off',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <h3>Sign-off</h3>
    <p class="hint">Approving freezes this analysis with its data hash. Later changes to its runs will mark it stale.</p>
    @if (mode() === 'approve') {
      <mat-form-field class="sm-full-width" subscriptSizing="dynamic">
        <mat-label>Note with the approval (optional)</mat-label>
        <textarea matInput name="note" [formControl]="note" rows="2"></textarea>
      </mat-form-field>
    }
    @if (mode() === 'return') {
      <mat-form-field class="sm-full-width">
        <mat-label>Why is it returned?</mat-label>
        <textarea matInput name="reason" [formControl]="reason" rows="3" required></textarea>
        @if (reason.invalid && reason.touched) {
          <mat-error>Say what needs to change (at least 3 characters).</mat-error>
        }
      </mat-form-field>
    }
    @if (error(); as e) {
      <p class="sm-note sm-note-error" role="alert"><mat-icon>error</mat-icon>{{ e }}</p>
    }
    <div class="buttons">
      <button mat-flat-button (click)="approve()" [disabled]="busy()"><mat-icon>verified</mat-icon>Approve analysis</button>
      <button mat-stroked-button (click)="returnForRework()" [disabled]="busy()"><mat-icon>assignment_return</mat-icon>Return with a reason</button>
    </div>
  `,
  styles: `
    h3 {
      font: var(--mat-sys-title-small);
      margin-bottom: 4px;
    }
    .hint {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
      margin: 0 0 8px;
    }
    .buttons {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
    }
  `,
})
export class SignOff {
  private readonly api = inject(ReviewApi);
  readonly analysisId = input.required<number>();
  readonly signed = output<AnalysisDetail>();

  protected readonly note = new FormControl('', { nonNullable: true });
  protected readonly reason = new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.minLength(3)] });
  /** The first press of a button opens its text field; the second press sends. */
  protected readonly mode = signal<'approve' | 'return' | null>(null);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected approve(): void {
    if (this.mode() !== 'approve') {
      this.mode.set('approve');
      return;
    }
    this.run(this.api.approve(this.analysisId(), this.note.value.trim()));
  }

  protected returnForRework(): void {
    if (this.mode() !== 'return') {
      this.mode.set('return');
      return;
    }
    this.reason.markAsTouched();
    if (this.reason.invalid) return;
    this.run(this.api.returnForRework(this.analysisId(), this.reason.value.trim()));
  }

  private run(call: ReturnType<ReviewApi['approve']>): void {
    this.busy.set(true);
    this.error.set(null);
    call.subscribe({
      next: (a) => {
        this.busy.set(false);
        this.mode.set(null);
        this.signed.emit(a);
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.error.set(e instanceof ApiError ? e.message : 'The sign-off could not be recorded.');
      },
    });
  }
}
