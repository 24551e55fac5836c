import type { PlanBody } from '../../shared/runs.js';
import { HttpError } from '../http-error.js';
import type { Setup } from './study-setup.js';

/** A generated run before it is stored (code and ids are given on commit). */
export interface GeneratedRun {
  standardOrder: number;
  runOrder: number;
  block: string;
  centrePoint: boolean;
  settings: Record<string, string>;
}
export interface GeneratedPlan {
  runs: GeneratedRun[];
  summary: Record<string, unknown>;
}

/** Bridges the study set-up to the design engine in server/stats/designs (pending: not merged yet). */
export function generatePlan(_setup: Setup, _body: PlanBody): GeneratedPlan {
  throw new HttpError(503, 'Plan generation is not available yet: the design engine (server/stats/designs) has not been merged');
}
