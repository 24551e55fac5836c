import { ChangeDetectionStrategy, Component, ViewEncapsulation, computed, input, output } from '@angular/core';
import { AgGridAngular } from 'ag-grid-angular';
import {
  CellApiModule,
  CellStyleModule,
  ClientSideRowModelModule,
  ColumnApiModule,
  CustomEditorModule,
  DateEditorModule,
  HighlightChangesModule,
  ModuleRegistry,
  NumberFilterModule,
  RenderApiModule,
  RowApiModule,
  RowStyleModule,
  ScrollApiModule,
  SelectEditorModule,
  TextEditorModule,
  TextFilterModule,
  TooltipModule,
  themeQuartz,
  type CellEditRequestEvent,
  type ColDef,
  type ColGroupDef,
  type GetRowIdParams,
  type GridApi,
  type GridReadyEvent,
  type RowClassRules,
} from 'ag-grid-community';
import type { Run } from '../studies/study-types';
import type { PasteTarget } from './paste-plan';

// Only what the run sheet uses (STACK.md pitfall 4: AllCommunityModule adds ~330 kB).
ModuleRegistry.registerModules([
  ClientSideRowModelModule,
  TextEditorModule,
  SelectEditorModule,
  DateEditorModule,
  HighlightChangesModule,
  CustomEditorModule,
  TextFilterModule,
  NumberFilterModule,
  RowStyleModule,
  CellStyleModule,
  TooltipModule,
  RowApiModule,
  ScrollApiModule,
  ColumnApiModule,
  CellApiModule,
  RenderApiModule,
]);

/** Colours come from the app's Material tokens, so the grid follows light/dark with the rest of the app. */
const THEME = themeQuartz.withParams({
  fontFamily: 'inherit',
  fontSize: 13,
  backgroundColor: 'var(--mat-sys-surface-container-lowest)',
  foregroundColor: 'var(--mat-sys-on-surface)',
  headerBackgroundColor: 'var(--mat-sys-surface-container)',
  headerTextColor: 'var(--mat-sys-on-surface)',
  accentColor: 'var(--mat-sys-primary)',
  borderColor: 'var(--mat-sys-outline-variant)',
  oddRowBackgroundColor: 'var(--mat-sys-surface-container-low)',
  rowHeight: 36,
  headerHeight: 40,
  wrapperBorderRadius: 12,
});

export interface CellEdit {
  run: Run;
  colId: string;
  oldText: string;
  newText: string;
}

export interface GridPaste {
  text: string;
  target: PasteTarget;
}

export type RowActionKind = 'attachments' | 'history' | 'remove' | 'restore';

/** What renderers and editors reach through the grid context (they live outside Angular's inputs). */
export interface GridContext {
  rowAction(kind: RowActionKind, run: Run): void;
  editRefused(message: string): void;
  canEdit: boolean;
}

/**
 * A thin wrapper over ag-grid for the run sheet: rows and columns in, edits / pastes / row actions
 * out. The grid never changes its data itself (readOnlyEdit): the page saves and hands back new rows.
 * Block paste is not in the community edition, so the wrapper catches the browser's paste event and
 * resolves where the block lands from the grid's public API (focused cell, displayed rows/columns).
 */
@Component({
  selector: 'sm-run-grid',
  changeDetection: ChangeDetectionStrategy.OnPush,
  encapsulation: ViewEncapsulation.None,
  imports: [AgGridAngular],
  host: { '(paste)': 'handlePaste($event)', class: 'sm-run-grid' },
  template: `
    <ag-grid-angular
      class="grid"
      [theme]="theme"
      [rowData]="rows()"
      [columnDefs]="columns()"
      [defaultColDef]="defaultColDef"
      [getRowId]="rowId"
      [context]="context()"
      [rowClassRules]="rowClassRules"
      [readOnlyEdit]="true"
      [singleClickEdit]="false"
      [stopEditingWhenCellsLoseFocus]="true"
      [enterNavigatesVerticallyAfterEdit]="true"
      [tooltipShowDelay]="300"
      [animateRows]="false"
      (gridReady)="ready($event)"
      (cellEditRequest)="editRequested($event)"
    />
  `,
  styles: `
    .sm-run-grid {
      display: block;
    }
    .sm-run-grid .grid {
      display: block;
      height: 100%;
      min-height: 360px;
    }
    .sm-run-grid .sm-row-excluded {
      --ag-background-color: var(--mat-sys-error-container);
      background-image: repeating-linear-gradient(135deg, transparent 0 10px, color-mix(in srgb, var(--mat-sys-error) 8%, transparent) 10px 12px);
    }
    .sm-run-grid .sm-row-removed {
      color: var(--mat-sys-on-surface-variant);
      text-decoration: line-through;
    }
    .sm-run-grid .sm-cell-number {
      font-variant-numeric: tabular-nums;
      text-align: right;
    }
    .sm-run-grid .sm-cell-editable {
      background-color: color-mix(in srgb, var(--mat-sys-primary) 4%, transparent);
    }
    /* Out of the plausible range: tinted AND marked with an icon, never colour alone. */
    .sm-run-grid .sm-out-of-range {
      color: var(--mat-sys-on-tertiary-container);
      background-color: var(--sm-accent-container);
      font-weight: 500;
    }
    .sm-run-grid .sm-out-of-range::before,
    .sm-run-grid .sm-excluded-mark::before {
      font-family: 'Material Symbols Outlined';
      font-size: 16px;
      vertical-align: -3px;
      margin-right: 4px;
    }
    .sm-run-grid .sm-out-of-range::before {
      content: 'warning';
    }
    .sm-run-grid .sm-excluded-mark::before {
      content: 'block';
      color: var(--mat-sys-error);
    }
  `,
})
export class RunGrid {
  readonly rows = input.required<Run[]>();
  readonly columns = input.required<(ColDef<Run> | ColGroupDef<Run>)[]>();
  readonly canEdit = input(false);
  readonly cellEdit = output<CellEdit>();
  readonly blockPaste = output<GridPaste>();
  readonly rowAction = output<{ kind: RowActionKind; run: Run }>();
  readonly refused = output<string>();

  protected readonly theme = THEME;
  private api: GridApi<Run> | null = null;
  protected readonly defaultColDef: ColDef<Run> = { sortable: true, filter: true, resizable: true, minWidth: 80 };
  protected readonly rowClassRules: RowClassRules<Run> = {
    'sm-row-excluded': (p) => !!p.data && p.data.excluded && p.data.removedAt === null,
    'sm-row-removed': (p) => !!p.data && p.data.removedAt !== null,
  };
  protected readonly rowId = (p: GetRowIdParams<Run>) => String(p.data.id);
  protected readonly context = computed<GridContext>(() => ({
    canEdit: this.canEdit(),
    rowAction: (kind, run) => this.rowAction.emit({ kind, run }),
    editRefused: (message) => this.refused.emit(message),
  }));

  protected ready(e: GridReadyEvent<Run>): void {
    this.api = e.api;
  }

  protected editRequested(e: CellEditRequestEvent<Run>): void {
    const colId = e.column.getColId();
    if (!e.data) return;
    const text = (v: unknown) => (v === null || v === undefined ? '' : String(v));
    if (text(e.newValue) === text(e.oldValue)) return;
    this.cellEdit.emit({ run: e.data, colId, oldText: text(e.oldValue), newText: text(e.newValue) });
  }

  protected handlePaste(event: ClipboardEvent): void {
    const api = this.api;
    // While a cell editor is open the paste belongs to its input, as in any text field.
    if (!api || !this.canEdit() || api.getEditingCells().length > 0) return;
    const focused = api.getFocusedCell();
    const text = event.clipboardData?.getData('text/plain') ?? '';
    if (!focused || focused.rowPinned) {
      this.refused.emit('Click the cell where the pasted block should start, then paste again.');
      return;
    }
    event.preventDefault();
    const columns = api.getAllDisplayedColumns();
    const start = columns.findIndex((c) => c.getColId() === focused.column.getColId());
    const rowIds: number[] = [];
    for (let i = focused.rowIndex; i < api.getDisplayedRowCount(); i++) {
      const id = api.getDisplayedRowAtIndex(i)?.data?.id;
      if (id !== undefined) rowIds.push(id);
    }
    this.blockPaste.emit({ text, target: { rowIds, colIds: columns.slice(start).map((c) => c.getColId()) } });
  }

  /** After a paste or undo, the user sees the rows that changed. */
  flash(runIds: number[], colIds: string[]): void {
    const api = this.api;
    if (!api) return;
    const nodes = runIds.map((id) => api.getRowNode(String(id))).filter((n) => n !== undefined);
    api.flashCells({ rowNodes: nodes, columns: colIds });
  }
}
