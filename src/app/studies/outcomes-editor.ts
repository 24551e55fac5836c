import { ChangeDetectionStrategy, Component } from '@angular/core';
import { FormArray, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import type { Observable } from 'rxjs';
import { outcomesBody, type OutcomesBody } from '../../../shared/studies';
import { outcomeGroup, outcomesValue, type OutcomeGroup } from './setup-forms';
import { SetupListEditor } from './setup-list-editor';
import type { StudyDetail } from './study-types';

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
export class OutcomesEditor extends SetupListEditor<OutcomeGroup, OutcomesBody> {
  constructor() {
    super('outcomes', outcomesBody, 'Outcomes');
  }

  protected groupsOf(s: StudyDetail): OutcomeGroup[] {
    return s.outcomes.map((o) => outcomeGroup(o));
  }

  protected blank(): OutcomeGroup {
    return outcomeGroup();
  }

  protected bodyOf(list: FormArray<OutcomeGroup>): OutcomesBody {
    return outcomesValue(list);
  }

  protected put(id: number, body: OutcomesBody): Observable<unknown> {
    return this.api.putOutcomes(id, body.outcomes);
  }
}
