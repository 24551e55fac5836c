import { Routes } from '@angular/router';

/** The analysis tabs of a study, mounted under /studies/:id by studies/study.routes.ts. */
export const ANALYSIS_ROUTES: Routes = [
  { path: 'analysis', title: 'Analysis · Specimetry', loadComponent: () => import('./analysis-workspace').then((m) => m.AnalysisWorkspace) },
  { path: 'analyses', title: 'Saved analyses · Specimetry', loadComponent: () => import('./saved-analyses').then((m) => m.SavedAnalyses) },
  { path: 'analyses/:aid', title: 'Saved analysis · Specimetry', loadComponent: () => import('./analysis-view').then((m) => m.AnalysisView) },
];
