import Papa from 'papaparse';
import { HISTORY_COLUMNS, type HistoryColumn, type HistoryMapping } from '../../shared/calc.js';
import { DECIMAL_RE } from '../../shared/studies.js';
import type { PointFrame } from '../calc/displacement-angle.js';
import { HttpError } from '../http-error.js';
import type { ParsedTable } from './import-parse.js';

/**
 * Between the parsed file (import-parse.ts, the same CSV/XLSX reader as the run-sheet import) and the
 * angle engine: guessing which column is which, and turning text cells into numbers. A cell that is
 * not a plain decimal number becomes NaN, so the engine drops the row and reports it with its reason
 * instead of this layer guessing what "1,5" or "n/a" meant.
 */

/** Header words: unit suffixes in brackets dropped, split at separators and letter/digit boundaries. */
function words(header: string): string[] {
  return header
    .toLowerCase()
    .replace(/\s*[[(].*?[\])]\s*/g, ' ')
    .replace(/(?<=[a-z])(?=\d)|(?<=\d)(?=[a-z])/g, ' ')
    .split(/[\s_\-.:/]+/)
    .filter((w) => w !== '');
}

const FRAME_WORDS = new Set(['frame', 'frames', 'image', 'img', 'step', 'increment', 'inc', 'time', 't', 'stage']);
const POINT_WORDS: Record<string, '1' | '2'> = { '1': '1', '2': '2', a: '1', b: '2', left: '1', right: '2', lower: '1', upper: '2' };
const X_WORDS = new Set(['x', 'ux', 'dx', 'dispx']);
const Y_WORDS = new Set(['y', 'uy', 'dy', 'dispy']);

function componentOf(ws: readonly string[]): 'x' | 'y' | null {
  const x = ws.some((w) => X_WORDS.has(w));
  const y = ws.some((w) => Y_WORDS.has(w));
  if (x !== y) return x ? 'x' : 'y';
  if (x) return null;
  // u/v as the component only when no explicit x/y is named ("u1", "v2").
  const u = ws.includes('u');
  const v = ws.includes('v');
  return u !== v ? (u ? 'x' : 'y') : null;
}

/**
 * Guess the mapping from header names: a frame/time column, and for each point (1/2, A/B, left/right;
 * point 1 is the one on the −x side) its x/y (or u/v) displacement. Unrecognised columns stay unmapped;
 * the user completes the mapping on screen.
 */
export function suggestHistoryMapping(headers: readonly string[]): Partial<HistoryMapping> {
  const out: Partial<HistoryMapping> = {};
  const taken = new Set<string>();
  const take = (col: HistoryColumn, h: string) => {
    if (out[col] === undefined && !taken.has(h)) {
      out[col] = h;
      taken.add(h);
    }
  };
  for (const h of headers) {
    const ws = words(h);
    if (ws.length > 0 && ws.length <= 2 && FRAME_WORDS.has(ws[0]!)) take('frame', h);
  }
  for (const h of headers) {
    const ws = words(h);
    const points = [...new Set(ws.map((w) => POINT_WORDS[w]).filter((p) => p !== undefined))];
    const comp = componentOf(ws);
    if (points.length === 1 && comp) take(`u${points[0]}${comp}` as HistoryColumn, h);
  }
  return out;
}

function cellNumber(text: string | undefined): number {
  const t = (text ?? '').trim();
  return DECIMAL_RE.test(t) ? Number(t) : Number.NaN;
}

/**
 * Rows of the file as engine input, through the mapping.
 * @throws {HttpError} 400 naming the mapped column that is not in the file, or a column mapped twice
 */
export function historyRows(table: ParsedTable, mapping: HistoryMapping, fileName: string): PointFrame[] {
  const index = {} as Record<HistoryColumn, number>;
  const used = new Map<string, HistoryColumn>();
  for (const col of HISTORY_COLUMNS) {
    const h = mapping[col];
    const i = table.headers.findIndex((x) => x === h);
    if (i < 0) {
      throw new HttpError(400, `mapping.${col}: column "${h}" is not in "${fileName}" (columns: ${table.headers.filter((x) => x).join(', ')})`, {
        details: [{ path: `mapping.${col}`, message: `No column "${h}" in the file` }],
      });
    }
    const other = used.get(h);
    if (other) throw new HttpError(400, `mapping.${col}: column "${h}" is already mapped to ${other}; each quantity needs its own column`, { details: [{ path: `mapping.${col}`, message: 'Mapped twice' }] });
    used.set(h, col);
    index[col] = i;
  }
  return table.rows.map((cells) => ({
    frame: cellNumber(cells[index.frame]),
    u1x: cellNumber(cells[index.u1x]),
    u1y: cellNumber(cells[index.u1y]),
    u2x: cellNumber(cells[index.u2x]),
    u2y: cellNumber(cells[index.u2y]),
  }));
}

/** The identity mapping used for rows pushed as JSON (they are stored under these headers). */
export const PUSHED_MAPPING: HistoryMapping = { frame: 'frame', u1x: 'u1x', u1y: 'u1y', u2x: 'u2x', u2y: 'u2y' };

/**
 * Pushed JSON rows as CSV text, so a script's history is kept as a file like an upload is, and its
 * checksum means the same thing. null becomes an empty cell (a missing value the engine reports).
 */
export function pushedRowsCsv(rows: readonly { frame: number; u1x: number | null; u1y: number | null; u2x: number | null; u2y: number | null }[]): string {
  const data = rows.map((r) => HISTORY_COLUMNS.map((c) => (r[c] === null ? '' : String(r[c]))));
  return Papa.unparse({ fields: [...HISTORY_COLUMNS], data }, { newline: '\n' }) + '\n';
}
