import { ChangeDetectionStrategy, Component } from '@angular/core';
import { FormArray, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatTooltipModule } from '@angular/material/tooltip';
import type { Observable } from 'rxjs';
import { responsesBody, type ResponsesBody } from '../../../shared/studies';
import { responseGroup, responsesValue, type ResponseGroup } from './setup-forms';
import { SetupListEditor } from './setup-list-editor';
import type { ResponseGoal, StudyDetail } from './study-types';

export const GOAL_LABELS: Record<ResponseGoal, string> = {
  nominal: 'Hit a target value',
  smaller: 'Smaller is better',
  larger: 'Larger is better',
  scatter: 'Least scatter',
};

/** Responses: what is measured on each specimen, how precisely, what is wanted, what is plausible. */
@Component({
  selector: 'sm-responses-editor',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule, MatTooltipModule],
  template: `
    <section class="sm-panel" aria-labelledby="responses-head">
      <div class="head">
        <h2 class="section" id="responses-head">Responses</h2>
        <span class="sub">What you measure on each specimen. Values outside the plausible range are flagged, not refused.</span>
      </div>
      @for (p of problems(); track $index) {
        <div class="sm-note sm-note-error" role="alert" data-testid="responses-error"><mat-icon>error</mat-icon>{{ p }}</div>
      }
      <form [formGroup]="root" (ngSubmit)="save()">
        <div formArrayName="responses">
          @for (r of list.controls; track r; let i = $index) {
            <fieldset class="item" [formGroupName]="i" [attr.data-response]="i">
              <legend>Response {{ i + 1 }}</legend>
              <div class="row">
                <mat-form-field appearance="outline" subscriptSizing="dynamic" class="grow">
                  <mat-label>Name</mat-label>
                  <input matInput formControlName="name" placeholder="e.g. Anisotropy parameter H" />
                  <mat-error>{{ err(r.controls.name, 'a response name') }}</mat-error>
                </mat-form-field>
                <mat-form-field appearance="outline" subscriptSizing="dynamic" class="narrow">
                  <mat-label>Symbol</mat-label>
                  <input matInput formControlName="symbol" placeholder="e.g. H" />
                  <mat-error>{{ err(r.controls.symbol, 'a symbol') }}</mat-error>
                </mat-form-field>
                <mat-form-field appearance="outline" subscriptSizing="dynamic" class="narrow">
                  <mat-label>Unit</mat-label>
                  <input matInput formControlName="unit" />
                  <mat-error>{{ err(r.controls.unit, 'a unit') }}</mat-error>
                </mat-form-field>
                <mat-form-field appearance="outline" subscriptSizing="dynamic" class="narrow">
                  <mat-label>Decimals</mat-label>
                  <input matInput type="number" min="0" max="10" formControlName="decimals" />
                  <mat-error>{{ err(r.controls.decimals, 'the number of decimals') }}</mat-error>
                </mat-form-field>
                @if (store.canEdit()) {
                  <button mat-icon-button type="button" (click)="remove(i)" [attr.aria-label]="'Remove response ' + (i + 1)" matTooltip="Remove response"><mat-icon>delete</mat-icon></button>
                }
              </div>
              <div class="row">
                <mat-form-field appearance="outline" subscriptSizing="dynamic" class="grow">
                  <mat-label>Goal</mat-label>
                  <mat-select formControlName="goal">
                    @for (g of goals; track g) {
                      <mat-option [value]="g">{{ goalLabels[g] }}</mat-option>
                    }
                  </mat-select>
                </mat-form-field>
                @if (r.controls.goal.value === 'nominal') {
                  <mat-form-field appearance="outline" subscriptSizing="dynamic" class="narrow">
                    <mat-label>Target</mat-label>
                    <input matInput formControlName="target" inputmode="decimal" />
                    <mat-error>{{ err(r.controls.target, 'a target') }}</mat-error>
                  </mat-form-field>
                }
                <mat-form-field appearance="outline" subscriptSizing="dynamic" class="narrow">
                  <mat-label>Plausible from</mat-label>
                  <input matInput formControlName="rangeMin" inputmode="decimal" />
                  <mat-error>{{ err(r.controls.rangeMin, 'a lower bound') }}</mat-error>
                </mat-form-field>
                <mat-form-field appearance="outline" subscriptSizing="dynamic" class="narrow">
                  <mat-label>Plausible to</mat-label>
                  <input matInput formControlName="rangeMax" inputmode="decimal" />
                  <mat-error>{{ err(r.controls.rangeMax, 'an upper bound') }}</mat-error>
                </mat-form-field>
              </div>
            </fieldset>
          } @empty {
            <p class="empty">No responses yet. A response is what you measure, such as the anisotropy parameter H or an r-value.</p>
          }
        </div>
        @if (store.canEdit()) {
          <div class="actions">
            <button mat-stroked-button type="button" (click)="add()" data-testid="add-response"><mat-icon>add</mat-icon> Add response</button>
            <span class="spacer"></span>
            <button mat-flat-button type="submit" [disabled]="busy() || root.pristine" data-testid="save-responses">Save responses</button>
          </div>
        }
      </form>
    </section>
  `,
  styleUrl: './setup-editors.scss',
})
export class ResponsesEditor extends SetupListEditor<ResponseGroup, ResponsesBody> {
  protected readonly goals = Object.keys(GOAL_LABELS) as ResponseGoal[];
  protected readonly goalLabels = GOAL_LABELS;

  constructor() {
    super('responses', responsesBody, 'Responses');
  }

  protected groupsOf(s: StudyDetail): ResponseGroup[] {
    return s.responses.map((r) => responseGroup(r));
  }

  protected blank(): ResponseGroup {
    return responseGroup();
  }

  protected bodyOf(list: FormArray<ResponseGroup>): ResponsesBody {
    return responsesValue(list);
  }

  protected put(id: number, body: ResponsesBody): Observable<unknown> {
    return this.api.putResponses(id, body.responses);
  }
}
