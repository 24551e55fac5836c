import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { ColDef, ValueFormatterParams } from 'ag-grid-community';
import type { GroupDescriptives } from '../../../shared/analysis';
import type { DescriptivesResult } from '../../../server/stats/types';
import { DataGrid } from './data-grid';
import { formatNumber } from './format';

interface DescRow {
  group: string;
  n: number;
  mean: number;
  sd: number | null;
  cv: number | null;
  min: number;
  max: number;
  ciLower: number | null;
  ciUpper: number | null;
}

const num = (p: ValueFormatterParams<DescRow, number | null>) => formatNumber(p.value ?? null);

const COLUMNS: ColDef<DescRow>[] = [
  { field: 'group', headerName: 'Setting', minWidth: 160, flex: 2 },
  { field: 'n', headerName: 'n', maxWidth: 80, type: 'rightAligned' },
  { field: 'mean', headerName: 'Mean', valueFormatter: num, type: 'rightAligned' },
  { field: 'sd', headerName: 'SD', valueFormatter: num, type: 'rightAligned' },
  { field: 'cv', headerName: 'CV', valueFormatter: num, type: 'rightAligned', headerTooltip: 'SD / |mean|' },
  { field: 'ciLower', headerName: '95 % CI low', valueFormatter: num, type: 'rightAligned' },
  { field: 'ciUpper', headerName: '95 % CI high', valueFormatter: num, type: 'rightAligned' },
  { field: 'min', headerName: 'Min', valueFormatter: num, type: 'rightAligned' },
  { field: 'max', headerName: 'Max', valueFormatter: num, type: 'rightAligned' },
];

function toRow(g: GroupDescriptives, names: Record<string, string>): DescRow {
  const group = Object.entries(g.levels)
    .map(([f, level]) => `${names[f] ?? f} = ${level}`)
    .join(', ');
  return { group, n: g.n, mean: g.mean, sd: g.sd, cv: g.cv, min: g.min, max: g.max, ciLower: g.ciLower, ciUpper: g.ciUpper };
}

/** Descriptives per level of each factor and per cell, as two exportable grids. */
@Component({
  selector: 'sm-descriptives-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DataGrid],
  template: `
    <h3>Per level</h3>
    <sm-data-grid [rows]="levelRows()" [columns]="columns" fileName="descriptives-per-level.csv" label="Descriptives per level" data-testid="grid-levels" />
    <h3>Per cell (every combination of levels)</h3>
    <sm-data-grid [rows]="cellRows()" [columns]="columns" fileName="descriptives-per-cell.csv" label="Descriptives per cell" data-testid="grid-cells" />
    @if (descriptives().emptyCells.length > 0) {
      <p class="empty">Cells without runs: {{ descriptives().emptyCells.join(', ') }}.</p>
    }
  `,
  styles: `
    h3 {
      font: var(--mat-sys-title-small);
      margin: 12px 0 6px;
    }
    .empty {
      font: var(--mat-sys-body-small);
    }
  `,
})
export class DescriptivesPanel {
  readonly descriptives = input.required<DescriptivesResult>();
  readonly names = input<Record<string, string>>({});
  protected readonly columns = COLUMNS;
  protected readonly levelRows = computed(() => Object.values(this.descriptives().byLevel).flatMap((groups) => groups.map((g) => toRow(g, this.names()))));
  protected readonly cellRows = computed(() => this.descriptives().byCell.map((g) => toRow(g, this.names())));
}
