import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { HttpError } from '../http-error.js';
import { assertSafeZip } from '../ops/zip-guard.js';

/**
 * Turns an uploaded CSV or XLSX file into a header row and data rows of plain text. Cells are kept
 * as text so the values reach the run sheet exactly as typed (CSV) or as the workbook stores them
 * (XLSX numbers have no trailing zeros; that is the workbook's own representation).
 */

export interface ParsedTable {
  headers: string[];
  rows: string[][];
}

export const MAX_IMPORT_ROWS = 200_000;

const isXlsx = (name: string, mime: string, buf: Buffer) =>
  /\.xlsx$/i.test(name) || mime === 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet' || (buf[0] === 0x50 && buf[1] === 0x4b);

export async function parseImportFile(fileName: string, mime: string, buf: Buffer): Promise<ParsedTable> {
  if (buf.length === 0) throw new HttpError(400, `The file "${fileName}" is empty`);
  const table = isXlsx(fileName, mime, buf) ? await parseXlsx(fileName, buf) : parseCsv(fileName, buf);
  const headers = table.headers.map((h) => h.trim());
  if (headers.every((h) => h === '')) throw new HttpError(400, `The file "${fileName}" has no header row`);
  const seen = new Set<string>();
  for (const h of headers) {
    if (h === '') continue;
    if (seen.has(h.toLowerCase())) throw new HttpError(400, `Column "${h}" appears twice in the header of "${fileName}"; rename one`);
    seen.add(h.toLowerCase());
  }
  const rows = table.rows.filter((r) => r.some((c) => c.trim() !== ''));
  if (rows.length === 0) throw new HttpError(400, `The file "${fileName}" has a header but no data rows`);
  if (rows.length > MAX_IMPORT_ROWS) throw new HttpError(413, `The file "${fileName}" has ${rows.length} rows; at most ${MAX_IMPORT_ROWS} per import`);
  return { headers, rows };
}

function parseCsv(fileName: string, buf: Buffer): ParsedTable {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(buf);
  } catch {
    // Expected for files saved in a legacy code page: refuse rather than guess the encoding.
    throw new HttpError(400, `The file "${fileName}" is not UTF-8 text; save it as "CSV UTF-8" and upload again`);
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (text.includes('\u0000')) throw new HttpError(400, `The file "${fileName}" contains binary data; upload a CSV or XLSX file`);
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: 'greedy', delimitersToGuess: [',', ';', '\t', '|'] });
  const fatal = parsed.errors.find((e) => e.type === 'Quotes');
  if (fatal) throw new HttpError(400, `The file "${fileName}" has an unclosed quote near row ${(fatal.row ?? 0) + 1}`);
  const [headers = [], ...rows] = parsed.data;
  return { headers, rows };
}

async function parseXlsx(fileName: string, buf: Buffer): Promise<ParsedTable> {
  const wb = new ExcelJS.Workbook();
  assertSafeZip(fileName, buf); // before the library inflates every part into memory
  try {
    await wb.xlsx.load(buf as unknown as ArrayBuffer);
  } catch {
    // Expected for damaged or non-XLSX zip files: the library throws on anything it cannot read.
    throw new HttpError(400, `The file "${fileName}" is not a readable XLSX workbook`);
  }
  const ws = wb.worksheets[0];
  if (!ws) throw new HttpError(400, `The workbook "${fileName}" has no worksheet`);
  const out: string[][] = [];
  const width = ws.columnCount;
  ws.eachRow({ includeEmpty: true }, (row) => {
    const cells: string[] = [];
    for (let c = 1; c <= width; c++) cells.push(cellText(row.getCell(c).value));
    out.push(cells);
  });
  const [headers = [], ...rows] = out;
  return { headers, rows };
}

function cellText(v: ExcelJS.CellValue): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number' || typeof v === 'boolean') return String(v);
  if (typeof v === 'string') return v;
  if (v instanceof Date) return v.toISOString().slice(0, 10);
  if ('richText' in v) return v.richText.map((t) => t.text).join('');
  if ('result' in v) return v.result === undefined || v.result === null || typeof v.result === 'object' ? '' : String(v.result);
  if ('text' in v) return String(v.text);
  if ('error' in v) return String(v.error);
  return '';
}
