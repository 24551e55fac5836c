import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import type { RunEdit } from '../../../shared/runs';
import type { Outcome, Run } from '../studies/study-types';
import { cellText, type CellSpec } from './run-cells';

/** A stale per-cell save (409): what I typed against what is stored now. */
export interface CellConflict {
  runCode: string;
  column: string;
  /** The value shown before I typed (what my edit was based on). */
  before: string;
  mine: string;
  /** The value stored now, written by someone else since I loaded the sheet. */
  theirs: string;
  /** My edit again, based on the current version: what "Apply mine" sends. */
  retry: RunEdit;
}

/**
 * Builds the conflict from the run as the server holds it now. Returns null when the other change
 * already holds exactly what I typed: then nothing is lost by adopting it, and no dialog is needed.
 */
export function cellConflict(spec: CellSpec, edit: RunEdit, before: string, mine: string, current: Run, outcomes: Outcome[]): CellConflict | null {
  const theirs = cellText(spec, current, outcomes);
  if (theirs === mine.trim()) return null;
  return { runCode: current.code, column: spec.label, before, mine: mine.trim(), theirs, retry: { ...edit, version: current.version } };
}

export type ConflictChoice = 'theirs' | 'mine';

/** Shows both values side by side; nothing is overwritten until the user picks. */
@Component({
  selector: 'sm-conflict-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatDialogModule, MatButtonModule, MatIconModule],
  template: `
    <h2 mat-dialog-title><mat-icon class="warn">sync_problem</mat-icon> Changed by someone else</h2>
    <mat-dialog-content>
      <p>
        Run <strong>{{ c.runCode }}</strong>, column <strong>{{ c.column }}</strong>, was changed after you loaded the sheet.
        Your value was not saved.
      </p>
      <dl class="compare" data-testid="conflict">
        <dt>When you loaded the sheet</dt>
        <dd>{{ c.before || '(empty)' }}</dd>
        <dt>Stored now</dt>
        <dd data-testid="conflict-theirs">{{ c.theirs || '(empty)' }}</dd>
        <dt>You typed</dt>
        <dd data-testid="conflict-mine">{{ c.mine || '(empty)' }}</dd>
      </dl>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button [mat-dialog-close]="'theirs'">Keep the stored value</button>
      <button mat-flat-button [mat-dialog-close]="'mine'">Replace with mine</button>
    </mat-dialog-actions>
  `,
  styles: `
    .warn {
      vertical-align: middle;
      color: var(--mat-sys-error);
    }
    .compare {
      display: grid;
      grid-template-columns: max-content 1fr;
      gap: 6px 16px;
      dt {
        color: var(--mat-sys-on-surface-variant);
      }
      dd {
        margin: 0;
        font-weight: 500;
      }
    }
  `,
})
export class ConflictDialog {
  protected readonly c = inject<CellConflict>(MAT_DIALOG_DATA);
}
