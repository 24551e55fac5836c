import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { ApiError } from '../core/api-error';
import { ReviewApi } from './review-api';

export interface ReviewerChoice {
  userId: number;
  name: string;
  accountRole: string;
}

/** The owner asks chosen reviewers (study members with the reviewer role) to review the analysis. */
@Component({
  selector: 'sm-review-request',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <h3>Request a review</h3>
    @if (reviewers().length === 0) {
      <p class="hint">No study member has the reviewer role yet. Add a statistician or supervisor as reviewer on the study's members page.</p>
    } @else {
      <div class="choices" role="group" aria-label="Reviewers">
        @for (r of reviewers(); track r.userId) {
          <mat-checkbox [checked]="chosen().has(r.userId)" (change)="toggle(r.userId, $event.checked)" [attr.data-reviewer]="r.name">
            {{ r.name }} <span class="role">{{ r.accountRole }}</span>
          </mat-checkbox>
        }
      </div>
      <mat-form-field class="sm-full-width" subscriptSizing="dynamic">
        <mat-label>Message to the reviewers (optional)</mat-label>
        <textarea matInput name="message" [formControl]="message" rows="2"></textarea>
      </mat-form-field>
      @if (error(); as e) {
        <p class="sm-note sm-note-error" role="alert"><mat-icon>error</mat-icon>{{ e }}</p>
      }
      <button mat-flat-button (click)="send()" [disabled]="busy()"><mat-icon>outgoing_mail</mat-icon>Request review</button>
    }
  `,
  styles: `
    h3 {
      font: var(--mat-sys-title-small);
      margin-bottom: 6px;
    }
    .choices {
      display: flex;
      flex-direction: column;
      margin-bottom: 8px;
    }
    .role {
      font: var(--mat-sys-label-small);
      color: var(--mat-sys-on-surface-variant);
      text-transform: capitalize;
      margin-left: 4px;
    }
    .hint {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    button {
      margin-top: 8px;
    }
  `,
})
export class ReviewRequest {
  private readonly api = inject(ReviewApi);
  readonly analysisId = input.required<number>();
  readonly reviewers = input.required<ReviewerChoice[]>();
  readonly requested = output<number>();

  protected readonly message = new FormControl('', { nonNullable: true });
  private readonly picked = signal<ReadonlySet<number> | null>(null);
  /** Everyone is ticked until the owner changes the choice: the usual case is "ask all reviewers". */
  protected readonly chosen = computed(() => this.picked() ?? new Set(this.reviewers().map((r) => r.userId)));
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected toggle(id: number, on: boolean): void {
    const next = new Set(this.chosen());
    if (on) next.add(id);
    else next.delete(id);
    this.picked.set(next);
  }

  protected send(): void {
    const ids = [...this.chosen()];
    if (ids.length === 0) {
      this.error.set('Choose at least one reviewer.');
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    this.api.requestReview(this.analysisId(), ids, this.message.value.trim()).subscribe({
      next: (r) => {
        this.busy.set(false);
        this.message.reset();
        this.requested.emit(r.mailed);
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.error.set(e instanceof ApiError ? e.message : 'The review request could not be sent.');
      },
    });
  }
}
