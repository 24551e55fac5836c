import type { ColDef, ColGroupDef, ValueGetterParams } from 'ag-grid-community';
import type { Factor, Outcome, Response, Run } from '../studies/study-types';
import { DecimalEditor, type DecimalEditorParams } from './decimal-editor';
import { RowActions } from './row-actions';
import { colId } from './run-cells';

/** Numbers typed as text sort as numbers; empty cells go last either way. */
function numericCompare(a: string | null | undefined, b: string | null | undefined): number {
  const x = a === '' || a == null ? Number.NaN : Number(a);
  const y = b === '' || b == null ? Number.NaN : Number(b);
  if (Number.isNaN(x) && Number.isNaN(y)) return 0;
  if (Number.isNaN(x)) return 1;
  if (Number.isNaN(y)) return -1;
  return x - y;
}

const numberFilter = (get: (r: Run) => string | undefined) => ({
  filter: 'agNumberColumnFilter',
  filterValueGetter: (p: ValueGetterParams<Run>) => {
    const t = p.data ? get(p.data) : undefined;
    return t === undefined || t === '' ? null : Number(t);
  },
  comparator: numericCompare,
  cellClass: 'sm-cell-number',
});

const unitSuffix = (unit: string) => (unit ? ` (${unit})` : '');

function rangeText(r: Response): string {
  if (r.rangeMin !== null && r.rangeMax !== null) return `${r.rangeMin} to ${r.rangeMax}`;
  if (r.rangeMin !== null) return `at least ${r.rangeMin}`;
  if (r.rangeMax !== null) return `at most ${r.rangeMax}`;
  return '';
}

/**
 * Column definitions of the run sheet, built from the study's set-up. Editability depends on the
 * caller's role and on the run (removed runs are read-only until restored).
 */
export function runColumns(factors: Factor[], responses: Response[], outcomes: Outcome[], canEdit: boolean): (ColDef<Run> | ColGroupDef<Run>)[] {
  const editable = (p: { data?: Run }) => canEdit && !!p.data && p.data.removedAt === null;
  const editClass = canEdit ? ['sm-cell-editable'] : [];
  const outcomeLabel = (id: number | null) => outcomes.find((o) => o.id === id)?.label ?? '';

  const code: ColDef<Run> = {
    colId: 'code',
    headerName: 'Run',
    field: 'code',
    pinned: 'left',
    width: 104,
    filter: 'agTextColumnFilter',
    cellClassRules: { 'sm-excluded-mark': (p) => !!p.data?.excluded },
    tooltipValueGetter: (p) =>
      p.data?.removedAt !== null && p.data?.removedAt !== undefined
        ? `Removed: ${p.data.removedReason ?? ''}`
        : p.data?.excluded
          ? `Excluded from the analysis: ${outcomeLabel(p.data.outcomeId)}${p.data.outcomeReason ? ' — ' + p.data.outcomeReason : ''}`
          : null,
  };
  const runCols: ColDef<Run>[] = [
    { colId: 'standardOrder', headerName: 'Std order', field: 'standardOrder', width: 120, filter: 'agNumberColumnFilter', cellClass: 'sm-cell-number' },
    { colId: 'runOrder', headerName: 'Run order', field: 'runOrder', width: 124, filter: 'agNumberColumnFilter', cellClass: 'sm-cell-number', sort: 'asc' },
    { colId: 'block', headerName: 'Block', field: 'block', width: 90, filter: 'agTextColumnFilter' },
  ];

  const settings: ColDef<Run>[] = factors.map((f) => ({
    colId: colId.setting(f.symbol),
    headerName: `${f.symbol}${unitSuffix(f.unit)}`,
    headerTooltip: `${f.name} — planned setting`,
    width: 110,
    valueGetter: (p: ValueGetterParams<Run>) => p.data?.settings[f.symbol] ?? '',
    ...(f.kind === 'numeric' ? numberFilter((r) => r.settings[f.symbol]) : { filter: 'agTextColumnFilter' }),
  }));

  const measured: ColDef<Run>[] = factors
    .filter((f) => f.tracksMeasured)
    .map((f) => ({
      colId: colId.measured(f.symbol),
      headerName: `${f.symbol} measured${unitSuffix(f.unit)}`,
      headerTooltip: `${f.name} as machined / measured on the specimen`,
      width: 140,
      editable,
      valueGetter: (p: ValueGetterParams<Run>) => p.data?.measured[f.symbol]?.text ?? '',
      cellEditor: DecimalEditor,
      cellEditorParams: { label: `${f.symbol} measured` } satisfies DecimalEditorParams,
      ...numberFilter((r) => r.measured[f.symbol]?.text),
      cellClass: ['sm-cell-number', ...editClass],
    }));

  const values: ColDef<Run>[] = responses.map((r) => ({
    colId: colId.value(r.symbol),
    headerName: `${r.symbol}${unitSuffix(r.unit)}`,
    headerTooltip: `${r.name}; ${r.decimals} decimals${rangeText(r) ? '; plausible ' + rangeText(r) : ''}`,
    width: 120,
    editable,
    valueGetter: (p: ValueGetterParams<Run>) => p.data?.values[r.symbol]?.text ?? '',
    cellEditor: DecimalEditor,
    cellEditorParams: { label: r.symbol, decimals: r.decimals } satisfies DecimalEditorParams,
    ...numberFilter((run) => run.values[r.symbol]?.text),
    cellClass: ['sm-cell-number', ...editClass],
    cellClassRules: { 'sm-out-of-range': (p) => !!p.data?.values[r.symbol]?.outOfRange },
    tooltipValueGetter: (p) => (p.data?.values[r.symbol]?.outOfRange ? `Outside the plausible range (${rangeText(r)}): check the value` : null),
  }));

  const record: ColDef<Run>[] = [
    {
      colId: 'outcome',
      headerName: 'Outcome',
      width: 170,
      editable,
      valueGetter: (p) => outcomeLabel(p.data?.outcomeId ?? null),
      cellEditor: 'agSelectCellEditor',
      cellEditorParams: { values: ['', ...outcomes.map((o) => o.label)] },
      filter: 'agTextColumnFilter',
      cellClass: editClass,
      cellClassRules: { 'sm-excluded-mark': (p) => !!p.data && p.data.excluded && p.data.removedAt === null },
    },
    { colId: 'outcomeReason', headerName: 'Reason', field: 'outcomeReason', width: 180, editable, filter: 'agTextColumnFilter', cellClass: editClass, tooltipField: 'outcomeReason' },
    { colId: 'operator', headerName: 'Operator', field: 'operator', width: 120, editable, filter: 'agTextColumnFilter', cellClass: editClass },
    { colId: 'testedOn', headerName: 'Tested on', field: 'testedOn', width: 130, editable, cellEditor: 'agDateStringCellEditor', filter: 'agTextColumnFilter', cellClass: editClass },
    { colId: 'notes', headerName: 'Notes', field: 'notes', width: 220, editable, filter: 'agTextColumnFilter', cellClass: editClass, tooltipField: 'notes' },
  ];

  const files: ColDef<Run> = {
    colId: 'attachments',
    headerName: 'Files',
    valueGetter: (p) => p.data?.attachmentCount ?? 0,
    width: canEdit ? 130 : 100,
    // Kept in view: the files, history and removal of a run are reachable however wide the sheet is.
    pinned: 'right',
    filter: 'agNumberColumnFilter',
    cellRenderer: RowActions,
    sortable: true,
  };

  return [
    code,
    { headerName: 'Order', children: runCols },
    ...(settings.length ? [{ headerName: 'Planned settings', children: settings }] : []),
    ...(measured.length ? [{ headerName: 'Measured geometry', children: measured }] : []),
    ...(values.length ? [{ headerName: 'Responses', children: values }] : []),
    { headerName: 'Record', children: record },
    files,
  ];
}
