import PDFDocument from 'pdfkit';
import SVGtoPDF from 'svg-to-pdfkit';
import type { ReportModel } from '../services/report.js';
import { pdfText } from './pdf-text.js';
import { allTables, dateText, type Table } from './tables.js';

/**
 * The PDF report (PDFKit, charts placed as vector SVG with svg-to-pdfkit). Same content and order as
 * the printable page; tables are laid out by hand because PDFKit has no table primitive. A draft gets
 * a diagonal DRAFT mark on every page, a stale analysis a warning line in every footer.
 */

const PAGE = { width: 595.28, height: 841.89, margin: 50 };
const CONTENT_W = PAGE.width - 2 * PAGE.margin;
const BOTTOM = PAGE.height - PAGE.margin - 20;
const BLUE = '#0072B2';

type Doc = PDFKit.PDFDocument;

function ensure(doc: Doc, height: number): void {
  if (doc.y + height > BOTTOM) doc.addPage();
}

function heading(doc: Doc, text: string): void {
  ensure(doc, 60);
  doc.moveDown(0.8).font('Helvetica-Bold').fontSize(13).fillColor(BLUE).text(pdfText(text), PAGE.margin, doc.y, { width: CONTENT_W });
  doc.moveTo(PAGE.margin, doc.y + 1).lineTo(PAGE.margin + CONTENT_W, doc.y + 1).lineWidth(1).strokeColor(BLUE).stroke();
  doc.moveDown(0.4).fillColor('#1d1d1f');
}

function para(doc: Doc, text: string, opts: { size?: number; colour?: string; bold?: boolean } = {}): void {
  doc.font(opts.bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(opts.size ?? 9.5).fillColor(opts.colour ?? '#1d1d1f');
  ensure(doc, doc.heightOfString(pdfText(text), { width: CONTENT_W }) > 200 ? 40 : doc.heightOfString(pdfText(text), { width: CONTENT_W }));
  doc.text(pdfText(text), PAGE.margin, doc.y, { width: CONTENT_W, align: 'left' });
  doc.moveDown(0.3);
}

function columnWidths(t: Table): number[] {
  const n = t.headers.length;
  const lengths = t.headers.map((h, j) => Math.max(h.length, ...t.rows.map((r) => (r[j] ?? '').length)));
  const first = Math.min(Math.max(lengths[0]! * 4.6 + 8, 80), CONTENT_W * 0.42);
  const rest = lengths.slice(1).reduce((a, b) => a + b, 0) || 1;
  return [first, ...lengths.slice(1).map((l) => ((CONTENT_W - first) * l) / rest)].slice(0, n);
}

function drawRow(doc: Doc, cells: string[], widths: number[], opts: { bold: boolean; shade: boolean }): void {
  doc.font(opts.bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(8.5);
  const texts = cells.map(pdfText);
  const h = Math.max(...texts.map((c, j) => doc.heightOfString(c, { width: widths[j]! - 6 }))) + 5;
  ensure(doc, h);
  const y = doc.y;
  if (opts.shade) doc.rect(PAGE.margin, y, CONTENT_W, h).fillColor('#eef5fb').fill();
  let x = PAGE.margin;
  texts.forEach((c, j) => {
    doc.fillColor('#1d1d1f').text(c, x + 3, y + 2.5, { width: widths[j]! - 6, align: j === 0 ? 'left' : 'right', lineBreak: true });
    x += widths[j]!;
  });
  doc.moveTo(PAGE.margin, y + h).lineTo(PAGE.margin + CONTENT_W, y + h).lineWidth(0.4).strokeColor('#c8c8cc').stroke();
  doc.x = PAGE.margin;
  doc.y = y + h;
}

function table(doc: Doc, t: Table): void {
  ensure(doc, 60);
  doc.moveDown(0.4).font('Helvetica-Bold').fontSize(10).fillColor('#1d1d1f').text(pdfText(t.title), PAGE.margin, doc.y, { width: CONTENT_W });
  doc.moveDown(0.2);
  const widths = columnWidths(t);
  const marked = new Set(t.marked ?? []);
  drawRow(doc, t.headers, widths, { bold: true, shade: false });
  t.rows.forEach((r, i) => drawRow(doc, r, widths, { bold: marked.has(i), shade: marked.has(i) }));
  if (t.note) {
    doc.moveDown(0.2);
    para(doc, t.note, { size: 8, colour: '#5a5a60' });
  }
}

function chart(doc: Doc, svg: string, caption: string): void {
  const w = CONTENT_W;
  const h = (w * 360) / 640;
  ensure(doc, h + 24);
  const y = doc.y;
  SVGtoPDF(doc, svg, PAGE.margin, y, { width: w, height: h, fontCallback: (_f, bold) => (bold ? 'Helvetica-Bold' : 'Helvetica') });
  doc.x = PAGE.margin;
  doc.y = y + h + 2;
  para(doc, caption, { size: 8, colour: '#5a5a60' });
}

function decorate(doc: Doc, m: ReportModel): void {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    // Drawing into the bottom margin must not trigger PDFKit's automatic page break.
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    if (m.draft) {
      doc.save().rotate(-35, { origin: [PAGE.width / 2, PAGE.height / 2] }).font('Helvetica-Bold').fontSize(110).fillColor('#787882').fillOpacity(0.12)
        .text('DRAFT', 0, PAGE.height / 2 - 60, { width: PAGE.width, align: 'center', lineBreak: false }).restore();
      doc.fillOpacity(1);
    }
    const footer = `Specimetry · ${m.study.title} · analysis ${m.analysis.id} · data hash ${m.analysis.dataHash.slice(0, 16)}… · page ${i + 1} of ${range.count}`;
    doc.font('Helvetica').fontSize(7.5).fillColor('#5a5a60').text(pdfText(footer), PAGE.margin, PAGE.height - 36, { width: CONTENT_W, align: 'center', lineBreak: false });
    if (m.stale) {
      doc.font('Helvetica-Bold').fontSize(7.5).fillColor('#D55E00').text('STALE: the data changed after this analysis was saved.', PAGE.margin, PAGE.height - 26, { width: CONTENT_W, align: 'center', lineBreak: false });
    }
    doc.page.margins.bottom = bottom;
  }
}

export function renderReportPdf(m: ReportModel): Promise<Buffer> {
  const doc = new PDFDocument({ size: 'A4', margin: PAGE.margin, bufferPages: true, info: { Title: pdfText(`${m.study.title} — ${m.analysis.title}`), Author: 'Specimetry', Subject: 'Analysis report' } });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const tables = new Map(allTables(m).map((t) => [t.id, t]));
  const s = m.study;

  doc.font('Helvetica-Bold').fontSize(18).fillColor('#1d1d1f').text(pdfText(s.title), { width: CONTENT_W });
  para(doc, `Analysis report: ${m.analysis.title} · analysis ${m.analysis.id} · status ${m.analysis.status.replace('_', ' ')} · engine ${m.analysis.engineVersion} · generated ${dateText(m.generatedAt)}`, { size: 8.5, colour: '#5a5a60' });
  if (m.draft) para(doc, `DRAFT — this analysis is ${m.analysis.status.replace('_', ' ')} and not signed off.`, { bold: true });
  if (m.stale) para(doc, 'STALE — the study\'s data have changed since this analysis was saved; its numbers no longer describe the current run sheet.', { bold: true, colour: '#D55E00' });

  heading(doc, 'Study and material');
  const material: [string, string][] = [
    ['Specimen family', s.specimenFamily], ['Material grade', s.materialGrade], ['Batch / heat / coil', s.batch],
    ['Sheet thickness', s.thicknessMm === null ? '' : `${s.thicknessMm} mm`], ['Orientation to rolling direction', s.orientationDeg === null ? '' : `${s.orientationDeg}°`],
    ['Material description', s.materialDescription], ['Purpose', s.purpose], ['Owner', s.owner],
  ];
  for (const [k, v] of material) if (v) para(doc, `${k}: ${v}`);

  heading(doc, 'Design and runs');
  table(doc, tables.get('design')!);
  table(doc, tables.get('counts')!);

  heading(doc, 'Summary');
  para(doc, m.summary);

  heading(doc, 'Analysis of variance');
  table(doc, tables.get('anova')!);
  para(doc, m.readings.anova, { colour: '#2f4f3f' });
  if (m.result.notes.length) {
    para(doc, 'Notes from the engine', { bold: true });
    for (const n of m.result.notes) para(doc, `• ${n}`, { size: 8.5 });
  }

  heading(doc, 'Descriptive statistics');
  para(doc, m.readings.descriptives, { colour: '#2f4f3f' });
  for (const [id, t] of tables) if (id.startsWith('descriptives:')) table(doc, t);

  heading(doc, 'Assumption checks');
  table(doc, tables.get('assumptions')!);
  para(doc, m.readings.assumptions, { colour: '#2f4f3f' });

  heading(doc, 'Post-hoc comparisons');
  for (const [id, t] of tables) if (id.startsWith('tukey:')) table(doc, t);
  para(doc, m.readings.posthoc, { colour: '#2f4f3f' });

  heading(doc, 'Dispersion');
  for (const [id, t] of tables) if (id.startsWith('dispersion:')) table(doc, t);
  para(doc, m.readings.dispersion, { colour: '#2f4f3f' });

  heading(doc, 'Charts');
  for (const c of m.charts) chart(doc, c.svg, `${c.title} — ${c.caption}`);

  heading(doc, 'Review and approval');
  if (m.reviewers.length) for (const r of m.reviewers) para(doc, `Review requested from ${r.name} (${r.role}) on ${dateText(r.requestedAt)} by ${r.requestedBy}`);
  else para(doc, 'No review requested yet.');
  para(doc, `Saved ${dateText(m.analysis.createdAt)} by ${m.analysis.createdBy}.`);
  para(doc, m.approval ? `Approved ${dateText(m.approval.at)} by ${m.approval.by}.` : 'Not approved.', { bold: true });
  if (m.returnedReason) para(doc, `Last returned: ${m.returnedReason}`);
  para(doc, `Data hash (SHA-256): ${m.analysis.dataHash}`, { size: 8.5 });
  if (m.stale) para(doc, `Hash of today's data: ${m.analysis.currentHash}`, { size: 8.5, colour: '#D55E00' });

  heading(doc, 'Cautions');
  for (const c of m.cautions) para(doc, `• ${c}`);

  decorate(doc, m);
  doc.end();
  return done;
}
