import { eq } from 'drizzle-orm';
import type { CalcRunValue, CalcStudyOverview, DerivedHEstimateDto, DerivedHPreviewBody, DerivedHProvenance, DerivedHResultDto, DerivedHStoreBody } from '../../shared/calc.js';
import { estimateHForRuns, type HAssumption, type RunAngle } from '../calc/h-from-angle.js';
import type { Db } from '../db/client.js';
import { responses, studies } from '../db/schema.js';
import { conflict, HttpError } from '../http-error.js';
import type { Actor } from './actor.js';
import { audit } from './audit.js';
import { by } from './actor.js';
import { calcRunSummaries, type CalculatedValue, writeCalculatedValues } from './calc-values.js';
import { loadRuns } from './run-sheet.js';
import { loadSetup, putResponses, type Setup } from './study-setup.js';

/**
 * Derived response "estimated H": each run's relative-displacement angle (a response of the study,
 * usually filled by the per-run angle calculation) and its neck angle (a numeric factor, measured value
 * where recorded, or one fixed angle) go through the imposed-neck relation (server/calc/h-from-angle.ts).
 * The result is an ordinary response — marked by its `derivation` — so the analysis uses it like any
 * other. A run whose angle admits no solution gets no value and the reason; a value somebody typed by
 * hand into the derived response is never overwritten.
 */

export const DERIVATION_KIND = 'hill-h-from-angle' as const;

function studyOrientation(db: Db, studyId: number): number | null {
  return db.select({ o: studies.orientationDeg }).from(studies).where(eq(studies.id, studyId)).get()?.o ?? null;
}

/** The calculator pages' view of a study: responses (with derivations), factors, runs with provenance. */
export function calcOverview(db: Db, studyId: number, canEdit: boolean): CalcStudyOverview {
  const setup = loadSetup(db, studyId);
  return {
    studyId,
    orientationDeg: studyOrientation(db, studyId),
    responses: setup.responses.map((r) => ({ id: r.id, symbol: r.symbol, name: r.name, unit: r.unit, decimals: r.decimals, derivation: r.derivation ?? null })),
    factors: setup.factors.map((f) => ({ symbol: f.symbol, name: f.name, unit: f.unit, kind: f.kind, tracksMeasured: f.tracksMeasured })),
    runs: calcRunSummaries(db, studyId, setup),
    canEdit,
  };
}

function checkInputs(setup: Setup, body: DerivedHPreviewBody): void {
  if (!setup.responses.some((r) => r.symbol === body.angleResponse)) {
    throw new HttpError(400, `angleResponse: no response "${body.angleResponse}" in this study (responses: ${setup.responses.map((r) => r.symbol).join(', ')})`, { details: [{ path: 'angleResponse', message: 'Unknown response' }] });
  }
  if (body.neckAngle.kind === 'factor') {
    const sym = body.neckAngle.symbol;
    const f = setup.factors.find((x) => x.symbol === sym);
    if (!f) throw new HttpError(400, `neckAngle.symbol: no factor "${sym}" in this study`, { details: [{ path: 'neckAngle.symbol', message: 'Unknown factor' }] });
    if (f.kind !== 'numeric') throw new HttpError(400, `neckAngle.symbol: factor "${sym}" is categorical; the neck angle must be a numeric factor in degrees`, { details: [{ path: 'neckAngle.symbol', message: 'Not numeric' }] });
  }
}

/** Estimated H per run; nothing written. */
export function previewDerivedH(db: Db, studyId: number, body: DerivedHPreviewBody): DerivedHResultDto {
  const setup = loadSetup(db, studyId);
  checkInputs(setup, body);
  const loadAngleDeg = body.loadAngleDeg ?? studyOrientation(db, studyId) ?? 0;
  const runs = loadRuns(db, studyId, { setup });
  const summaries = new Map(calcRunSummaries(db, studyId, setup).map((s) => [s.runId, s]));
  const inputs = runs.map((run) => {
    let theta: number | null = null;
    let from: string | null = null;
    if (body.neckAngle.kind === 'fixed') {
      theta = body.neckAngle.valueDeg;
      from = 'fixed for all runs';
    } else {
      const sym = body.neckAngle.symbol;
      const measured = run.measured[sym];
      theta = measured ? measured.value : Number(run.settings[sym]);
      from = measured ? `measured ${sym}` : `nominal ${sym}`;
    }
    const value = summaries.get(run.id)?.values[body.angleResponse];
    const exact = value?.provenance?.kind === 'relative-displacement-angle' ? value.provenance.exactValue : value?.value;
    return { run, theta, from, phi: exact ?? null };
  });
  const set = estimateHForRuns(
    inputs.map((x): RunAngle => ({ runId: String(x.run.id), neckAngleDeg: x.theta ?? Number.NaN, relativeDisplacementAngleDeg: x.phi ?? Number.NaN, loadAngleDeg })),
    body.assumption as HAssumption,
  );
  const estimates: DerivedHEstimateDto[] = set.estimates.map((e, i) => {
    const x = inputs[i]!;
    const reason = e.error === null ? null : x.phi === null ? `no value of ${body.angleResponse} recorded for this run yet` : e.error;
    return { runId: x.run.id, code: x.run.code, neckAngleDeg: x.theta, neckAngleFrom: x.from, angleDeg: x.phi, H: e.H, r: e.r, reason };
  });
  return { calcVersion: set.calcVersion, method: set.method, loadAngleDeg, assumptions: [...set.assumptions], cautions: [...set.cautions], estimates };
}

/** Create (or reuse) the derived response, then write every run's estimate through the audited path. */
export function storeDerivedH(db: Db, actor: Actor, studyId: number, body: DerivedHStoreBody) {
  return db.transaction(() => {
    let setup = loadSetup(db, studyId);
    const existing = setup.responses.find((r) => r.symbol.toLowerCase() === body.target.symbol.toLowerCase());
    if (existing && existing.derivation?.['kind'] !== DERIVATION_KIND) {
      throw conflict(`Response "${existing.symbol}" holds measured values, not an H derivation; choose another symbol for the derived response`);
    }
    if (body.target.symbol === body.angleResponse) throw new HttpError(400, 'target.symbol: the derived response must differ from the angle response', { details: [{ path: 'target.symbol', message: 'Same as the angle' }] });
    if (!existing) {
      const keep = setup.responses.map(({ id, name, symbol, unit, decimals, goal, target, rangeMin, rangeMax }) => ({ id, name, symbol, unit, decimals, goal, target, rangeMin, rangeMax }));
      putResponses(db, actor, studyId, {
        responses: [...keep, { name: body.target.name, symbol: body.target.symbol, unit: '', decimals: 4, goal: 'scatter', target: null, rangeMin: null, rangeMax: null }],
      });
      setup = loadSetup(db, studyId);
    }
    const target = setup.responses.find((r) => r.symbol.toLowerCase() === body.target.symbol.toLowerCase())!;
    const preview = previewDerivedH(db, studyId, body);
    const summaries = new Map(calcRunSummaries(db, studyId, setup).map((s) => [s.runId, s.values]));
    const now = Date.now();
    const items: CalculatedValue[] = [];
    const estimates = preview.estimates.map((e): DerivedHEstimateDto => {
      const values = summaries.get(e.runId) ?? {};
      const old = values[target.symbol];
      const byHand = old !== undefined && old.provenance?.kind !== DERIVATION_KIND;
      if (byHand) return { ...e, H: null, r: null, reason: `${target.symbol} = ${old.text} was entered by hand; clear it on the run sheet to let the derivation fill it` };
      if (e.H === null) {
        if (old !== undefined) items.push({ runId: e.runId, symbol: target.symbol, text: null, provenance: null });
        return e;
      }
      const provenance = provenanceOf(values[body.angleResponse], body, preview, e, now);
      items.push({ runId: e.runId, symbol: target.symbol, text: e.H.toFixed(Math.max(target.decimals, 6)), provenance });
      return e;
    });
    const out = items.length ? writeCalculatedValues(db, actor, studyId, items, { source: 'calc-derived', reason: body.reason }) : { changes: [], warnings: [] };
    const derivation = {
      kind: DERIVATION_KIND,
      calcVersion: preview.calcVersion,
      method: preview.method,
      angleResponse: body.angleResponse,
      neckAngle: body.neckAngle,
      loadAngleDeg: preview.loadAngleDeg,
      assumption: body.assumption,
      updatedAt: now,
      withoutValue: estimates.filter((e) => e.H === null).map((e) => ({ runId: e.runId, code: e.code, reason: e.reason })),
    };
    db.update(responses).set({ derivation }).where(eq(responses.id, target.id)).run();
    audit(db, { ...by(actor), studyId, entity: 'response', entityId: String(target.id), action: 'derive', field: 'derivation', oldValue: target.derivation ? JSON.stringify(target.derivation) : null, newValue: JSON.stringify({ ...derivation, withoutValue: derivation.withoutValue.length }), reason: body.reason ?? null });
    return { response: { id: target.id, symbol: target.symbol, name: target.name, derivation }, result: { ...preview, estimates }, changes: out.changes, warnings: out.warnings };
  });
}

function provenanceOf(angleValue: CalcRunValue | undefined, body: DerivedHStoreBody, preview: DerivedHResultDto, e: DerivedHEstimateDto, now: number): DerivedHProvenance {
  const p = angleValue?.provenance;
  return {
    kind: DERIVATION_KIND,
    calcVersion: preview.calcVersion,
    angleResponse: body.angleResponse,
    angleText: angleValue?.text ?? '',
    angleSource: p?.kind === 'relative-displacement-angle' ? { attachmentId: p.attachmentId, sha256: p.sha256, method: p.method } : null,
    // Present whenever H is: estimateHForRuns only solves runs with both angles.
    neckAngleDeg: e.neckAngleDeg!,
    neckAngleFrom: e.neckAngleFrom!,
    loadAngleDeg: preview.loadAngleDeg,
    assumption: body.assumption,
    exactValue: e.H!,
    r: e.r,
    computedAt: now,
  };
}
