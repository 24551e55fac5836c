import { ChangeDetectionStrategy, Component, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { AgGridAngular } from 'ag-grid-angular';
import {
  CellStyleModule,
  ClientSideRowModelModule,
  type ColDef,
  ColumnAutoSizeModule,
  CsvExportModule,
  type GridApi,
  type GridReadyEvent,
  ModuleRegistry,
  TooltipModule,
  themeQuartz,
} from 'ag-grid-community';

// Only what the result tables use (STACK.md pitfall 4): AllCommunityModule would add ~330 kB.
ModuleRegistry.registerModules([ClientSideRowModelModule, CsvExportModule, CellStyleModule, ColumnAutoSizeModule, TooltipModule]);

/** The grid takes its colours from the Material system tokens, so it switches with light/dark by itself. */
const GRID_THEME = themeQuartz.withParams({
  backgroundColor: 'var(--mat-sys-surface-container-lowest)',
  foregroundColor: 'var(--mat-sys-on-surface)',
  headerBackgroundColor: 'var(--mat-sys-surface-container)',
  headerTextColor: 'var(--mat-sys-on-surface)',
  borderColor: 'var(--mat-sys-outline-variant)',
  oddRowBackgroundColor: 'var(--mat-sys-surface-container-low)',
  rowHoverColor: 'var(--mat-sys-secondary-container)',
  accentColor: 'var(--mat-sys-primary)',
  fontFamily: 'Roboto, system-ui, sans-serif',
  fontSize: 13,
  headerFontWeight: 500,
  wrapperBorderRadius: 8,
  spacing: 6,
});

/** A read-only result table (ag-grid) with CSV export; the page gives columns and rows. */
@Component({
  selector: 'sm-data-grid',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [AgGridAngular, MatButtonModule, MatIconModule],
  template: `
    <ag-grid-angular
      [theme]="theme"
      [rowData]="rows()"
      [columnDefs]="columns()"
      [domLayout]="'autoHeight'"
      [autoSizeStrategy]="{ type: 'fitGridWidth', defaultMinWidth: 80 }"
      [suppressCellFocus]="true"
      [attr.aria-label]="label()"
      (gridReady)="keep($event)"
    />
    <div class="actions">
      <button mat-stroked-button [disabled]="!ready()" (click)="exportCsv()"><mat-icon>download</mat-icon>CSV</button>
    </div>
  `,
  styles: `
    .actions {
      display: flex;
      justify-content: flex-end;
      margin-top: 8px;
    }
  `,
})
export class DataGrid<Row extends object> {
  readonly rows = input.required<Row[]>();
  readonly columns = input.required<ColDef<Row>[]>();
  readonly fileName = input.required<string>();
  readonly label = input('');

  protected readonly theme = GRID_THEME;
  protected readonly ready = signal(false);
  private api: GridApi<Row> | null = null;

  protected keep(event: GridReadyEvent<Row>): void {
    this.api = event.api;
    this.ready.set(true);
  }

  protected exportCsv(): void {
    this.api?.exportDataAsCsv({ fileName: this.fileName() });
  }
}
