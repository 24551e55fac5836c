import Papa from 'papaparse';
import { parseTsv } from './paste-parser';

/**
 * Reference: papaparse 5.7 (a maintained CSV/TSV parser) with delimiter "\t" and RFC 4180 quoting,
 * which is how spreadsheets write the text/plain flavour of a copied block. Papaparse returns one
 * extra [''] row for the block's closing line break, which spreadsheets do not mean as a row, so the
 * reference drops exactly that one.
 */
function reference(text: string): string[][] {
  const rows = Papa.parse<string[]>(text, { delimiter: '\t', newline: text.includes('\r\n') ? '\r\n' : '\n' }).data;
  const last = rows[rows.length - 1];
  if (/\r?\n$/.test(text) && last && last.length === 1 && last[0] === '') rows.pop();
  return rows;
}

describe('parseTsv (clipboard block from a spreadsheet)', () => {
  const cases: Record<string, string> = {
    'LF rows, trailing newline': '0.812\t0.790\n0.805\t0.801\n',
    'CRLF rows, trailing CRLF (what spreadsheets on Windows put on the clipboard)': '1.02\t0.98\r\n1.10\t1.04\r\n',
    'no trailing newline': '1\t2\n3\t4',
    'empty cells inside and at the end of a row': '1\t\t3\n\t5\t\n',
    'quoted cell holding a tab and a line break': '"a\tb"\t2\n"line1\nline2"\t4\n',
    'doubled quotes inside a quoted cell': '"5"" pipe"\tx\n',
    'a single cell': '0.850',
    'a blank row between rows (a copied empty cell)': '1\n\n3\n',
  };
  for (const [name, text] of Object.entries(cases)) {
    it(`matches papaparse: ${name}`, () => {
      expect(parseTsv(text)).toEqual(reference(text));
    });
  }

  it('keeps the text of each value exactly as typed', () => {
    // common practice, no source: trailing zeros carry the stated precision and must survive.
    expect(parseTsv('0.850\t1.0e-3\r\n')).toEqual([['0.850', '1.0e-3']]);
  });

  it('drops only one closing line break, so a final blank cell stays a row', () => {
    expect(parseTsv('1\n\n')).toEqual([['1'], ['']]);
  });

  it('returns no rows for an empty clipboard', () => {
    expect(parseTsv('')).toEqual([]);
  });

  it('treats a lone CR (older spreadsheet programs) as a row break', () => {
    expect(parseTsv('1\t2\r3\t4\r')).toEqual([
      ['1', '2'],
      ['3', '4'],
    ]);
  });
});
