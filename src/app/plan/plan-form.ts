import { FormControl, FormGroup, Validators } from '@angular/forms';
import { planBody, type PlanBody } from '../../../shared/runs';
import { DECIMAL_RE } from '../../../shared/studies';

/**
 * The plan builder's form and its translation to the shared `planBody`. The form is flatter than the
 * body (blocks as a choice plus a count, the effect as a kind plus fields) because that is how people
 * think about it; `toPlanBody` rebuilds the nested shape and reports problems against form fields.
 */
export function planForm() {
  return new FormGroup({
    design: new FormControl<'full' | 'fractional'>('full', { nonNullable: true }),
    p: new FormControl(1, { nonNullable: true, validators: [Validators.min(1), Validators.max(6)] }),
    generators: new FormControl('', { nonNullable: true }),
    replicates: new FormControl(2, { nonNullable: true, validators: [Validators.required, Validators.min(1), Validators.max(50)] }),
    blocks: new FormControl<'none' | 'perReplicate' | 'count'>('none', { nonNullable: true }),
    blockCount: new FormControl(2, { nonNullable: true, validators: [Validators.min(1), Validators.max(50)] }),
    centrePoints: new FormControl(0, { nonNullable: true, validators: [Validators.min(0), Validators.max(20)] }),
    seed: new FormControl(1, { nonNullable: true, validators: [Validators.required, Validators.min(0), Validators.max(2 ** 31 - 1)] }),
    randomise: new FormControl(true, { nonNullable: true }),
    effect: new FormControl<'none' | 'cohenF' | 'difference'>('cohenF', { nonNullable: true }),
    f: new FormControl('0.4', { nonNullable: true }),
    delta: new FormControl('', { nonNullable: true }),
    sigma: new FormControl('', { nonNullable: true }),
    alpha: new FormControl('0.05', { nonNullable: true }),
    targetPower: new FormControl('0.8', { nonNullable: true }),
  });
}
export type PlanForm = ReturnType<typeof planForm>;
type PlanValue = ReturnType<PlanForm['getRawValue']>;

export type PlanCheck = { ok: true; body: PlanBody } | { ok: false; errors: Partial<Record<keyof PlanValue, string>>; general: string[] };

/** Where a planBody issue belongs in the flat form. */
const FIELD_OF: Record<string, keyof PlanValue> = {
  'fraction.p': 'p',
  'fraction.generators': 'generators',
  fraction: 'p',
  blocks: 'blockCount',
  'power.effect.f': 'f',
  'power.effect.delta': 'delta',
  'power.effect.sigma': 'sigma',
  'power.alpha': 'alpha',
  'power.targetPower': 'targetPower',
};

function decimal(raw: string, field: keyof PlanValue, errors: Partial<Record<keyof PlanValue, string>>): number | undefined {
  const t = raw.trim();
  if (t === '') return undefined;
  if (!DECIMAL_RE.test(t)) {
    errors[field] = t.includes(',') ? `"${t}": use a point as the decimal mark` : `"${t}" is not a number`;
    return undefined;
  }
  return Number(t);
}

/**
 * @param centreOnFull whether the study's factors let a full factorial take centre points (every factor
 *   numeric with exactly two levels); otherwise a full factorial sends 0 centre points, as a fraction's
 *   value left in the hidden field must not travel with it.
 */
export function toPlanBody(v: PlanValue, centreOnFull = false): PlanCheck {
  const errors: Partial<Record<keyof PlanValue, string>> = {};
  const generators = v.generators
    .split(/[,;\s]+/)
    .map((g) => g.trim())
    .filter((g) => g !== '');
  let power: PlanBody['power'];
  if (v.effect !== 'none') {
    const alpha = decimal(v.alpha, 'alpha', errors) ?? 0.05;
    const target = decimal(v.targetPower, 'targetPower', errors);
    if (v.effect === 'cohenF') {
      const f = decimal(v.f, 'f', errors);
      if (f === undefined && !errors.f) errors.f = "Enter Cohen's f, e.g. 0.4 for a large effect";
      power = { effect: { kind: 'cohenF', f: f ?? 0 }, alpha, ...(target === undefined ? {} : { targetPower: target }) };
    } else {
      const delta = decimal(v.delta, 'delta', errors);
      const sigma = decimal(v.sigma, 'sigma', errors);
      if (delta === undefined && !errors.delta) errors.delta = 'Enter the difference to detect';
      if (sigma === undefined && !errors.sigma) errors.sigma = 'Enter the expected standard deviation';
      power = { effect: { kind: 'difference', delta: delta ?? 0, sigma: sigma ?? 0 }, alpha, ...(target === undefined ? {} : { targetPower: target }) };
    }
  }
  const candidate = {
    design: v.design,
    replicates: v.replicates,
    blocks: v.blocks === 'count' ? v.blockCount : v.blocks,
    centrePoints: v.design === 'fractional' || centreOnFull ? v.centrePoints : 0,
    seed: v.seed,
    randomise: v.randomise,
    ...(v.design === 'fractional' ? { fraction: { p: v.p, ...(generators.length ? { generators } : {}) } } : {}),
    ...(power ? { power } : {}),
  };
  const parsed = planBody.safeParse(candidate);
  const general: string[] = [];
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = issue.path.filter((p) => typeof p !== 'number').join('.');
      const field = FIELD_OF[key] ?? (key in v ? (key as keyof PlanValue) : undefined);
      if (field && !errors[field]) errors[field] = issue.message;
      else if (!field) general.push(issue.message);
    }
  }
  if (Object.keys(errors).length || general.length || !parsed.success) return { ok: false, errors, general };
  return { ok: true, body: parsed.data };
}

/** Puts a stored plan's spec back into the form (re-opening the Plan tab after committing). */
export function fillPlanForm(form: PlanForm, spec: PlanBody): void {
  const effect = spec.power?.effect;
  form.reset({
    design: spec.design,
    p: spec.fraction?.p ?? 1,
    generators: spec.fraction?.generators?.join(', ') ?? '',
    replicates: spec.replicates,
    blocks: typeof spec.blocks === 'number' ? 'count' : spec.blocks,
    blockCount: typeof spec.blocks === 'number' ? spec.blocks : 2,
    centrePoints: spec.centrePoints,
    seed: spec.seed,
    randomise: spec.randomise,
    effect: effect?.kind ?? 'none',
    f: effect?.kind === 'cohenF' ? String(effect.f) : '0.4',
    delta: effect?.kind === 'difference' ? String(effect.delta) : '',
    sigma: effect?.kind === 'difference' ? String(effect.sigma) : '',
    alpha: String(spec.power?.alpha ?? 0.05),
    targetPower: spec.power?.targetPower === undefined ? '' : String(spec.power.targetPower),
  });
}
