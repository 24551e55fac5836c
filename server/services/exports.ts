import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { DECIMAL_RE } from '../../shared/studies.js';
import type { Db } from '../db/client.js';
import { getStudyRow } from './studies.js';
import { runSheet } from './run-sheet.js';

/**
 * Run-sheet exports: CSV, XLSX and a printable HTML bench sheet. A spreadsheet treats a text cell that
 * starts with = + - @ (or a tab / carriage return that hides such a character) as a formula, so an
 * exported note like "=HYPERLINK(...)" would run on the reader's machine. Such text cells get a
 * leading apostrophe (OWASP "CSV Injection" guidance); numbers are written as numbers and are safe.
 */
const FORMULA_START = /^[=+\-@\t\r]/;

export function neutralise(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

export type Cell = string | number | null;

export interface SheetTable {
  title: string;
  headers: string[];
  rows: Cell[][];
}

export function runSheetTable(db: Db, studyId: number, includeRemoved: boolean): SheetTable {
  const study = getStudyRow(db, studyId);
  const sheet = runSheet(db, studyId, includeRemoved);
  const outcomeLabel = new Map(sheet.outcomes.map((o) => [o.id, o.label]));
  const measuredFactors = sheet.factors.filter((f) => f.tracksMeasured);
  const headers = [
    'run', 'standard order', 'run order', 'block', 'centre point',
    ...sheet.factors.map((f) => (f.unit ? `${f.symbol} [${f.unit}]` : f.symbol)),
    ...measuredFactors.map((f) => `${f.symbol} measured${f.unit ? ` [${f.unit}]` : ''}`),
    ...sheet.responses.map((r) => (r.unit ? `${r.symbol} [${r.unit}]` : r.symbol)),
    'outcome', 'outcome reason', 'excluded', 'operator', 'tested on', 'notes', 'attachments',
    ...(includeRemoved ? ['removed reason'] : []),
  ];
  const rows: Cell[][] = sheet.runs.map((r) => [
    r.code, r.standardOrder, r.runOrder, r.block, r.centrePoint ? 'yes' : '',
    ...sheet.factors.map((f) => numericOrText(r.settings[f.symbol] ?? '', f.kind === 'numeric')),
    ...measuredFactors.map((f) => r.measured[f.symbol]?.text ?? null),
    // The text as entered, so trailing zeros ("0.850") survive the round trip.
    ...sheet.responses.map((x) => r.values[x.symbol]?.text ?? null),
    r.outcomeId === null ? '' : (outcomeLabel.get(r.outcomeId) ?? ''), r.outcomeReason, r.excluded ? 'yes' : '', r.operator, r.testedOn, r.notes, r.attachmentCount,
    ...(includeRemoved ? [r.removedReason ?? ''] : []),
  ]);
  return { title: study.title, headers, rows };
}

function numericOrText(v: string, numeric: boolean): Cell {
  return numeric && v !== '' && Number.isFinite(Number(v)) ? Number(v) : v;
}

/**
 * A CSV cell: decimal text of a response stays exactly as typed (a plain "-0.42" is a number to a
 * spreadsheet, not a formula); any other text is neutralised.
 */
export function csvCell(c: Cell): string {
  return c === null ? '' : typeof c === 'number' || DECIMAL_RE.test(c) ? String(c) : neutralise(c);
}

export function toCsv(t: SheetTable): string {
  // BOM so that spreadsheet programs open the UTF-8 file with the right encoding (µ, °, names).
  return '\ufeff' + Papa.unparse({ fields: t.headers.map(neutralise), data: t.rows.map((r) => r.map(csvCell)) }, { newline: '\r\n' });
}

export async function toXlsx(t: SheetTable): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Specimetry';
  const ws = wb.addWorksheet('Run sheet');
  ws.addRow(t.headers.map(neutralise)).font = { bold: true };
  for (const r of t.rows) {
    ws.addRow(r.map((c) => (c === null ? null : typeof c === 'number' ? c : DECIMAL_RE.test(c) ? Number(c) : neutralise(c))));
  }
  ws.views = [{ state: 'frozen', ySplit: 1 }];
  return Buffer.from(await wb.xlsx.writeBuffer());
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (ch) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[ch]!);

/**
 * A printable bench sheet: one row per run in run order, the settings to machine, empty boxes for
 * what the bench records. Self-contained HTML (inline CSS, no script), so the CSP is no concern.
 */
export function toBenchSheetHtml(t: SheetTable, when: Date = new Date()): string {
  const head = t.headers.map((h) => `<th>${escapeHtml(h)}</th>`).join('');
  const body = t.rows.map((r) => `<tr>${r.map((c) => `<td>${escapeHtml(c === null ? '' : String(c))}</td>`).join('')}</tr>`).join('\n');
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(t.title)} — bench sheet</title>
<style>
  body { font: 10pt/1.3 system-ui, sans-serif; margin: 12mm; }
  h1 { font-size: 14pt; margin: 0 0 2mm; } p { margin: 0 0 4mm; color: #444; }
  table { border-collapse: collapse; width: 100%; }
  th, td { border: 1px solid #888; padding: 1.5mm 2mm; text-align: left; min-width: 12mm; }
  th { background: #eee; } tr { page-break-inside: avoid; }
  @page { size: A4 landscape; margin: 10mm; }
</style></head>
<body><h1>${escapeHtml(t.title)}</h1>
<p>Bench sheet printed ${escapeHtml(when.toISOString().slice(0, 16).replace('T', ' '))} UTC — ${t.rows.length} runs in run order. Record values as read; enter them in Specimetry the same day.</p>
<table><thead><tr>${head}</tr></thead><tbody>
${body}
</tbody></table></body></html>`;
}
