/**
 * PDFKit's built-in fonts (Helvetica) encode text as WinAnsi (Windows-1252): Greek letters and some
 * mathematical signs have no glyph there. Rather than ship a font file, the PDF spells them out;
 * the printable HTML page keeps the proper symbols.
 */
const SPELLED: Record<string, string> = {
  'η': 'eta', 'α': 'alpha', 'χ': 'chi', 'σ': 'sigma', 'μ': 'mu', 'Δ': 'Delta', 'ω': 'omega',
  '≥': '>=', '≤': '<=', '≠': '!=', '≈': '~', '−': '-', '★': '*', '✓': 'ok', '→': '->', '←': '<-',
  '\u2009': ' ', '\u202f': ' ', '\u00a0': ' ',
};

/** Windows-1252 characters in 0x80–0x9F that are not Latin-1 (all of Latin-1 0x20–0xFF is fine). */
const CP1252_EXTRA = new Set('€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ');

export function pdfText(s: string): string {
  let out = '';
  for (const ch of s) {
    const mapped = SPELLED[ch];
    if (mapped !== undefined) out += mapped;
    else {
      const code = ch.codePointAt(0)!;
      out += ch === '\n' || (code >= 0x20 && code <= 0x7e) || (code >= 0xa0 && code <= 0xff) || CP1252_EXTRA.has(ch) ? ch : '?';
    }
  }
  return out;
}
