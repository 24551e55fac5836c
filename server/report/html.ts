import { escapeHtml } from '../mail/mailer.js';
import type { ReportModel } from '../services/report.js';
import { allTables, dateText, type Table } from './tables.js';

/**
 * The printable report page: one self-contained HTML document (inline CSS and SVG, no scripts, so
 * it passes the app's content-security policy and prints the same anywhere). A draft carries a
 * diagonal DRAFT mark on every printed page; a stale analysis a red banner.
 */

const e = (s: string | number | null | undefined) => escapeHtml(s === null || s === undefined ? '' : String(s));

function table(t: Table): string {
  const marked = new Set(t.marked ?? []);
  return `<section class="table" id="${e(t.id)}"><h3>${e(t.title)}</h3><table><thead><tr>${t.headers.map((h) => `<th>${e(h)}</th>`).join('')}</tr></thead><tbody>${t.rows
    .map((r, i) => `<tr${marked.has(i) ? ' class="marked"' : ''}>${r.map((c, j) => (j === 0 ? `<th scope="row">${e(c)}</th>` : `<td>${e(c)}</td>`)).join('')}</tr>`)
    .join('')}</tbody></table>${t.note ? `<p class="note">${e(t.note)}</p>` : ''}</section>`;
}

const CSS = `
  :root { color-scheme: light; }
  body { font: 11pt/1.45 Roboto, Helvetica, Arial, sans-serif; color: #1d1d1f; max-width: 900px; margin: 24px auto; padding: 0 16px; }
  h1 { font-size: 20pt; margin: 0 0 4px; } h2 { font-size: 14pt; margin: 28px 0 8px; border-bottom: 2px solid #0072B2; padding-bottom: 2px; }
  h3 { font-size: 11.5pt; margin: 16px 0 6px; }
  table { border-collapse: collapse; width: 100%; font-variant-numeric: tabular-nums; font-size: 10pt; }
  th, td { border-bottom: 1px solid #d8d8dc; padding: 3px 6px; text-align: right; } thead th { border-bottom: 2px solid #5a5a60; }
  th[scope=row], thead th:first-child { text-align: left; } tr.marked th, tr.marked td { font-weight: 600; background: #eef5fb; }
  .note, .meta { color: #5a5a60; font-size: 9.5pt; } .reading { background: #f6f6f8; border-left: 3px solid #009E73; padding: 6px 10px; }
  .banner { padding: 8px 12px; margin: 12px 0; font-weight: 600; border: 2px solid; }
  .banner.stale { border-color: #D55E00; color: #8a3200; background: #fff1e8; } .banner.draft { border-color: #5a5a60; color: #3a3a3a; background: #f2f2f4; }
  .chart { break-inside: avoid; margin: 12px 0; } .chart svg { max-width: 100%; height: auto; border: 1px solid #e3e3e6; }
  .chart figcaption { font-size: 9.5pt; color: #5a5a60; }
  .cautions { border: 2px solid #E69F00; padding: 8px 14px; background: #fff8e6; }
  dl { display: grid; grid-template-columns: max-content 1fr; gap: 2px 16px; } dt { color: #5a5a60; } dd { margin: 0; }
  code { font-size: 9pt; word-break: break-all; }
  .watermark { position: fixed; top: 40%; left: 0; right: 0; text-align: center; font-size: 120pt; font-weight: 700; color: rgba(120,120,130,0.13); transform: rotate(-30deg); pointer-events: none; z-index: 0; }
  section.table { break-inside: avoid; }
  @media print { body { margin: 0; max-width: none; } h2 { break-after: avoid; } a { color: inherit; text-decoration: none; } }
`;

export function renderReportHtml(m: ReportModel): string {
  const s = m.study;
  const tables = allTables(m);
  const byId = new Map(tables.map((t) => [t.id, t]));
  const rest = tables.filter((t) => t.id.startsWith('descriptives:'));
  const tukey = tables.filter((t) => t.id.startsWith('tukey:'));
  const material: [string, string][] = [
    ['Specimen family', s.specimenFamily], ['Material grade', s.materialGrade], ['Batch / heat / coil', s.batch],
    ['Sheet thickness', s.thicknessMm === null ? '' : `${s.thicknessMm} mm`], ['Orientation to rolling direction', s.orientationDeg === null ? '' : `${s.orientationDeg}°`],
    ['Material description', s.materialDescription], ['Purpose', s.purpose], ['Owner', s.owner],
  ];
  const t = (id: string) => (byId.has(id) ? table(byId.get(id)!) : '');
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${e(`Report — ${m.analysis.title}`)}</title><style>${CSS}</style></head>
<body>
${m.draft ? '<div class="watermark" aria-hidden="true">DRAFT</div>' : ''}
<header>
  <h1>${e(s.title)}</h1>
  <p class="meta">Analysis report: ${e(m.analysis.title)} · analysis ${m.analysis.id} · status ${e(m.analysis.status.replace('_', ' '))} · engine ${e(m.analysis.engineVersion)} · generated ${e(dateText(m.generatedAt))}</p>
  ${m.draft ? `<div class="banner draft">DRAFT — this analysis is ${e(m.analysis.status.replace('_', ' '))} and not signed off.</div>` : ''}
  ${m.stale ? `<div class="banner stale">STALE — the study's data have changed since this analysis was saved; its numbers no longer describe the current run sheet.</div>` : ''}
</header>
<h2>Study and material</h2>
<dl>${material.filter(([, v]) => v).map(([k, v]) => `<dt>${e(k)}</dt><dd>${e(v)}</dd>`).join('')}</dl>
<h2>Design and runs</h2>
${t('design')}${t('counts')}
<h2>Summary</h2>
<p>${e(m.summary)}</p>
<h2>Analysis of variance</h2>
${t('anova')}
<p class="reading">${e(m.readings.anova)}</p>
${m.result.notes.length ? `<h3>Notes from the engine</h3><ul>${m.result.notes.map((n) => `<li>${e(n)}</li>`).join('')}</ul>` : ''}
<h2>Descriptive statistics</h2>
<p class="reading">${e(m.readings.descriptives)}</p>
${rest.map(table).join('')}
<h2>Assumption checks</h2>
${t('assumptions')}
<p class="reading">${e(m.readings.assumptions)}</p>
<h2>Post-hoc comparisons</h2>
${tukey.map(table).join('') || '<p>No Tukey comparisons (no significant term).</p>'}
<p class="reading">${e(m.readings.posthoc)}</p>
<h2>Dispersion</h2>
${tables.filter((x) => x.id.startsWith('dispersion:')).map(table).join('')}
<p class="reading">${e(m.readings.dispersion)}</p>
<h2>Charts</h2>
${m.charts.map((c) => `<figure class="chart" id="chart-${e(c.id)}">${c.svg}<figcaption>${e(c.title)} — ${e(c.caption)}</figcaption></figure>`).join('\n')}
<h2>Review and approval</h2>
${m.reviewers.length ? `<table><thead><tr><th>Reviewer</th><th>role</th><th>requested</th><th>by</th></tr></thead><tbody>${m.reviewers.map((r) => `<tr><th scope="row">${e(r.name)}</th><td>${e(r.role)}</td><td>${e(dateText(r.requestedAt))}</td><td>${e(r.requestedBy)}</td></tr>`).join('')}</tbody></table>` : '<p>No review requested yet.</p>'}
<dl>
  <dt>Saved</dt><dd>${e(dateText(m.analysis.createdAt))} by ${e(m.analysis.createdBy)}</dd>
  <dt>Approval</dt><dd>${m.approval ? `approved ${e(dateText(m.approval.at))} by ${e(m.approval.by)}` : 'not approved'}</dd>
  ${m.returnedReason ? `<dt>Last returned</dt><dd>${e(m.returnedReason)}</dd>` : ''}
  <dt>Data hash (SHA-256)</dt><dd><code>${e(m.analysis.dataHash)}</code></dd>
  ${m.stale ? `<dt>Hash of today's data</dt><dd><code>${e(m.analysis.currentHash)}</code></dd>` : ''}
</dl>
<h2>Cautions</h2>
<div class="cautions"><ul>${m.cautions.map((c) => `<li>${e(c)}</li>`).join('')}</ul></div>
</body></html>`;
}
