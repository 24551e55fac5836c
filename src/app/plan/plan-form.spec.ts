import { planForm, toPlanBody } from './plan-form';

describe('plan form to planBody', () => {
  it('builds a replicated full factorial with power from Cohen’s f', () => {
    const form = planForm();
    form.patchValue({ replicates: 3, seed: 42, effect: 'cohenF', f: '0.4', alpha: '0.05', targetPower: '0.8' });
    expect(toPlanBody(form.getRawValue())).toEqual({
      ok: true,
      body: { design: 'full', replicates: 3, blocks: 'none', centrePoints: 0, seed: 42, randomise: true, power: { effect: { kind: 'cohenF', f: 0.4 }, alpha: 0.05, targetPower: 0.8 } },
    });
  });

  it('builds a half fraction with generators and centre points', () => {
    const form = planForm();
    form.patchValue({ design: 'fractional', p: 1, generators: 'D=ABC', centrePoints: 3, effect: 'none' });
    const c = toPlanBody(form.getRawValue());
    expect(c.ok && c.body.fraction).toEqual({ p: 1, generators: ['D=ABC'] });
    expect(c.ok && c.body.centrePoints).toBe(3);
  });

  it('sends centre points with a full factorial only when the factors allow them', () => {
    const form = planForm();
    form.patchValue({ design: 'full', centrePoints: 3, effect: 'none' });
    const allowed = toPlanBody(form.getRawValue(), true);
    expect(allowed.ok && allowed.body.centrePoints).toBe(3);
    const notAllowed = toPlanBody(form.getRawValue());
    expect(notAllowed.ok && notAllowed.body.centrePoints).toBe(0);
  });

  it('says which blocks do not divide the replicates, on the block-count field', () => {
    const form = planForm();
    form.patchValue({ replicates: 3, blocks: 'count', blockCount: 2, effect: 'none' });
    const c = toPlanBody(form.getRawValue());
    expect(c.ok).toBe(false);
    expect(!c.ok && c.errors.blockCount).toBe('2 blocks do not divide 3 replicates');
  });

  it('asks for Δ and σ when the effect is a difference, and refuses a comma', () => {
    const form = planForm();
    form.patchValue({ effect: 'difference', delta: '0,05', sigma: '' });
    const c = toPlanBody(form.getRawValue());
    expect(!c.ok && c.errors).toMatchObject({ delta: '"0,05": use a point as the decimal mark', sigma: 'Enter the expected standard deviation' });
  });

  it('refuses a malformed generator with the shape it expects', () => {
    const form = planForm();
    form.patchValue({ design: 'fractional', generators: 'D:ABC', effect: 'none' });
    const c = toPlanBody(form.getRawValue());
    expect(!c.ok && c.errors.generators).toBe('A generator looks like D=ABC');
  });
});
