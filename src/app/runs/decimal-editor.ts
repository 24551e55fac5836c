import { ChangeDetectionStrategy, Component, ElementRef, signal, viewChild } from '@angular/core';
import type { ICellEditorAngularComp } from 'ag-grid-angular';
import type { ICellEditorParams } from 'ag-grid-community';
import type { Run } from '../studies/study-types';
import type { GridContext } from './run-grid';
import { decimalProblem } from './run-cells';

export interface DecimalEditorParams {
  /** Digits allowed after the point (the response's decimals); absent for measured geometry. */
  decimals?: number;
  label: string;
}

/**
 * Cell editor for decimal values. A text input, not a number input: the text typed is what is kept
 * ("0.850" stays "0.850", which a number field would turn into 0.85), and "1,5" gets a message
 * instead of silently becoming empty.
 */
@Component({
  selector: 'sm-decimal-editor',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <input
      #box
      class="box"
      inputmode="decimal"
      autocomplete="off"
      (input)="typed($event)"
      [attr.aria-label]="label()"
      [attr.aria-invalid]="problem() !== null"
      [attr.title]="problem() ?? hint()"
      [class.bad]="problem() !== null"
    />
  `,
  styles: `
    .box {
      width: 100%;
      height: 100%;
      box-sizing: border-box;
      border: 2px solid var(--mat-sys-primary);
      background: var(--mat-sys-surface);
      color: var(--mat-sys-on-surface);
      font: inherit;
      text-align: right;
      padding: 0 6px;
      outline: none;
      font-variant-numeric: tabular-nums;
    }
    .bad {
      border-color: var(--mat-sys-error);
      border-style: dashed;
    }
  `,
})
export class DecimalEditor implements ICellEditorAngularComp {
  private readonly box = viewChild.required<ElementRef<HTMLInputElement>>('box');
  protected readonly text = signal('');
  protected readonly label = signal('');
  protected readonly hint = signal('');
  private decimals: number | undefined;
  private startedByKey = false;
  private context: GridContext | null = null;
  protected readonly problem = signal<string | null>(null);

  agInit(params: ICellEditorParams<Run, string, GridContext> & DecimalEditorParams): void {
    this.decimals = params.decimals;
    this.context = params.context;
    this.label.set(`${params.label} for run ${params.data?.code ?? ''}`);
    this.hint.set(params.decimals === undefined ? 'A number, point as decimal mark' : `A number with at most ${params.decimals} decimals`);
    // Typing a character on a focused cell starts the edit with that character, as in a spreadsheet.
    const key = params.eventKey;
    this.startedByKey = typeof key === 'string' && key.length === 1;
    const start = typeof key === 'string' && key.length === 1 ? key : (params.value ?? '');
    this.text.set(start);
    this.problem.set(decimalProblem(start.trim(), this.decimals));
  }

  /**
   * ag-grid calls this once the editor is in the page; focusing earlier (before attachment) silently
   * fails and the keys typed right after the first one would be lost. The value is set here, not by a
   * template binding, so a late change detection cannot overwrite what is being typed.
   */
  afterGuiAttached(): void {
    const el = this.box().nativeElement;
    el.value = this.text();
    el.focus();
    // Opened by typing: keep typing after that first character. Opened by Enter/F2/double-click: replace all.
    if (this.startedByKey) el.setSelectionRange(el.value.length, el.value.length);
    else el.select();
  }

  protected typed(e: Event): void {
    const value = (e.target as HTMLInputElement).value;
    this.text.set(value);
    this.problem.set(decimalProblem(value.trim(), this.decimals));
  }

  getValue(): string {
    return this.text().trim();
  }

  /** A value the server would refuse is not sent: the edit is cancelled and the reason shown. */
  isCancelAfterEnd(): boolean {
    const problem = this.problem();
    if (problem) this.context?.editRefused(`${this.label()}: ${problem}`);
    return problem !== null;
  }
}
