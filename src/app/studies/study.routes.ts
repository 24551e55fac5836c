import { Routes } from '@angular/router';
import { ANALYSIS_ROUTES } from '../analysis/analysis.routes';

/** The tabs of one study; each lazy, all inside StudyPage (which provides the StudyStore). */
export const STUDY_ROUTES: Routes = [
  {
    path: '',
    loadComponent: () => import('./study-page').then((m) => m.StudyPage),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'overview' },
      { path: 'overview', title: 'Study · Specimetry', loadComponent: () => import('./study-overview').then((m) => m.StudyOverview) },
      { path: 'setup', title: 'Study set-up · Specimetry', loadComponent: () => import('./study-setup').then((m) => m.StudySetup) },
      { path: 'plan', title: 'Plan · Specimetry', loadComponent: () => import('../plan/plan-builder').then((m) => m.PlanBuilder) },
      { path: 'runs', title: 'Run sheet · Specimetry', loadComponent: () => import('../runs/run-sheet').then((m) => m.RunSheetPage) },
      { path: 'import', title: 'Import results · Specimetry', loadComponent: () => import('../runs/run-import').then((m) => m.RunImport) },
      ...ANALYSIS_ROUTES,
      { path: 'audit', title: 'Audit trail · Specimetry', loadComponent: () => import('../audit/study-audit').then((m) => m.StudyAudit) },
    ],
  },
];
