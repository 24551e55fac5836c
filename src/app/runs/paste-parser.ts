/**
 * Parses the text/plain a spreadsheet puts on the clipboard for a copied block: cells separated by
 * tabs, rows by CRLF or LF (a lone CR from older programs too), and a cell that holds a tab, a line
 * break or a quote wrapped in double quotes with inner quotes doubled. Spreadsheets end the block
 * with one line break, which is not an extra empty row.
 *
 * Own code rather than papaparse because papaparse ships as CommonJS only and the Angular build
 * bails out of optimising it; the spec checks this parser against papaparse as the reference.
 *
 * @param text clipboard text
 * @returns rows of cells; [] for empty text
 * @example parseTsv('1\t2\r\n3\t4\r\n') // [['1','2'],['3','4']]
 */
export function parseTsv(text: string): string[][] {
  if (text === '') return [];
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let i = 0;
  const n = text.length;
  let atCellStart = true;
  while (i < n) {
    const ch = text[i]!;
    if (atCellStart && ch === '"') {
      // Quoted cell: runs to the closing quote; "" inside stands for one quote.
      i++;
      while (i < n) {
        if (text[i] === '"') {
          if (text[i + 1] === '"') {
            cell += '"';
            i += 2;
            continue;
          }
          i++;
          break;
        }
        cell += text[i];
        i++;
      }
      atCellStart = false;
      continue;
    }
    atCellStart = false;
    if (ch === '\t') {
      row.push(cell);
      cell = '';
      atCellStart = true;
      i++;
    } else if (ch === '\r' || ch === '\n') {
      row.push(cell);
      rows.push(row);
      row = [];
      cell = '';
      atCellStart = true;
      i += ch === '\r' && text[i + 1] === '\n' ? 2 : 1;
    } else {
      cell += ch;
      i++;
    }
  }
  // Text that does not end with a line break still has its last row open.
  if (!atCellStart || row.length > 0 || cell !== '') {
    row.push(cell);
    rows.push(row);
  }
  return rows;
}
