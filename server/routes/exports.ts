import { Router } from 'express';
import { exportQuery } from '../../shared/runs.js';
import type { AppContext } from '../context.js';
import { ALL_STUDY_ROLES, studyMember } from '../auth/policy.js';
import { runSheetTable, toBenchSheetHtml, toCsv, toXlsx } from '../services/exports.js';

/** A file name safe in a Content-Disposition header: the study title reduced to plain characters. */
function fileBase(title: string, id: number): string {
  const base = title.normalize('NFKD').replace(/[^\w.-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60);
  return `${base || 'study'}-${id}-runs`;
}

export function exportsRouter(ctx: AppContext): Router {
  const r = Router();

  r.get('/studies/:id/export', studyMember(() => ctx.db, { studyRoles: ALL_STUDY_ROLES }), async (req, res) => {
    const q = exportQuery.parse(req.query);
    const table = runSheetTable(ctx.db, req.study!.id, q.includeRemoved === '1' || q.includeRemoved === 'true');
    const name = fileBase(table.title, req.study!.id);
    if (q.format === 'csv') {
      res.attachment(`${name}.csv`).type('text/csv; charset=utf-8').send(toCsv(table));
    } else if (q.format === 'xlsx') {
      res.attachment(`${name}.xlsx`).type('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet').send(await toXlsx(table));
    } else {
      res.type('text/html; charset=utf-8').send(toBenchSheetHtml(table));
    }
  });

  return r;
}
