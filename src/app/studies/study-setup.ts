import { ChangeDetectionStrategy, Component } from '@angular/core';
import { FactorsEditor } from './factors-editor';
import { OutcomesEditor } from './outcomes-editor';
import { ResponsesEditor } from './responses-editor';

/** The set-up tab: factors, responses and validity outcomes, each saved on its own. */
@Component({
  selector: 'sm-study-setup',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [FactorsEditor, ResponsesEditor, OutcomesEditor],
  template: `
    <div class="stack">
      <sm-factors-editor />
      <sm-responses-editor />
      <sm-outcomes-editor />
    </div>
  `,
  styles: `
    .stack {
      display: flex;
      flex-direction: column;
      gap: 20px;
    }
  `,
})
export class StudySetup {}
