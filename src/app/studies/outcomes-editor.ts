import { ChangeDetectionStrategy, Component, effect, inject, signal, untracked } from '@angular/core';
import { FormArray, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { outcomesBody } from '../../../shared/studies';
import { ApiError } from '../core/api-error';
import { Notifier } from '../core/notifier';
import { applySchema, outcomeGroup, outcomesValue, setupError, type OutcomeGroup } from './setup-forms';
import { StudyApi } from './study-api';
import { StudyStore } from './study-store';

/** The validity outcomes a run can end with; "not valid" ones keep the run in the sheet but out of the analysis. */
@Component({
  selector: 'sm-outcomes-editor',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <section class="sm-panel" aria-labelledby="outcomes-head">
      <div class="head">
        <h2 class="section" id="outcomes-head">Validity outcomes</h2>
        <span class="sub">How a test can end. Runs with an outcome that does not count are kept but excluded from the analysis.</span>
      </div>
      @for (p of problems(); track $index) {
        <div class="sm-note sm-note-error" role="alert"><mat-icon>error</mat-icon>{{ p }}</div>
      }
      <form [formGroup]="root" (ngSubmit)="save()">
        <div formArrayName="outcomes">
          @for (o of list.controls; track o; let i = $index) {
            <div class="outcome" [formGroupName]="i">
              <mat-form-field appearance="outline" subscriptSizing="dynamic" class="grow">
                <mat-label>Outcome {{ i + 1 }}</mat-label>
                <input matInput formControlName="label" />
                <mat-error>{{ err(o.controls.label, 'an outcome label') }}</mat-error>
              </mat-form-field>
              <mat-checkbox formControlName="valid">Counts in the analysis</mat-checkbox>
              @if (store.canEdit()) {
                <button mat-icon-button type="button" (click)="remove(i)" [attr.aria-label]="'Remove outcome ' + (i + 1)"><mat-icon>delete</mat-icon></button>
              }
            </div>
          }
        </div>
        @if (store.canEdit()) {
          <div class="actions">
            <button mat-stroked-button type="button" (click)="add()"><mat-icon>add</mat-icon> Add outcome</button>
            <span class="spacer"></span>
            <button mat-flat-button type="submit" [disabled]="busy() || root.pristine">Save outcomes</button>
          </div>
        }
      </form>
    </section>
  `,
  styleUrl: './setup-editors.scss',
})
export class OutcomesEditor {
  protected readonly store = inject(StudyStore);
  private readonly api = inject(StudyApi);
  private readonly notifier = inject(Notifier);
  protected readonly list = new FormArray<OutcomeGroup>([]);
  protected readonly root = new FormGroup({ outcomes: this.list });
  protected readonly problems = signal<string[]>([]);
  protected readonly busy = signal(false);
  /** Set after our own save: the reload must refill this form even though it was edited. */
  private refillNext = false;
  protected readonly err = setupError;

  constructor() {
    effect(() => {
      const s = this.store.study();
      // Another tab's save reloads the study too; unsaved edits here must survive that.
      if (!s || (untracked(() => this.root.dirty) && !this.refillNext)) return;
      this.refillNext = false;
      untracked(() => {
        this.list.clear();
        for (const o of s.outcomes) this.list.push(outcomeGroup(o));
        if (this.store.canEdit()) this.root.enable();
        else this.root.disable();
        this.root.markAsPristine();
      });
    });
  }

  protected add(): void {
    this.list.push(outcomeGroup());
    this.root.markAsDirty();
  }

  protected remove(i: number): void {
    this.list.removeAt(i);
    this.root.markAsDirty();
  }

  protected save(): void {
    const id = this.store.id();
    this.root.markAllAsTouched();
    if (id === null || this.list.invalid) return;
    const body = outcomesValue(this.list);
    const check = applySchema(outcomesBody, body, this.root);
    this.problems.set(check.unplaced);
    if (!check.ok) return;
    this.busy.set(true);
    this.api.putOutcomes(id, body.outcomes).subscribe({
      next: () => {
        this.busy.set(false);
        this.refillNext = true;
        this.notifier.info('Outcomes saved');
        this.store.reload();
      },
      error: (e: unknown) => {
        this.busy.set(false);
        if (e instanceof ApiError) this.problems.set([e.message]);
      },
    });
  }
}
