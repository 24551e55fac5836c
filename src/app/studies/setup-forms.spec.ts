import { FormArray, FormGroup } from '@angular/forms';
import { factorsBody, outcomesBody, responsesBody } from '../../../shared/studies';
import { applySchema, factorGroup, factorsValue, outcomeGroup, outcomesValue, responseGroup, responsesValue, setupError } from './setup-forms';
import { studyBody, studyForm, fieldError } from './study-form';

describe('set-up forms', () => {
  it('asks for a name and a well-formed symbol before anything is sent', () => {
    const f = factorGroup();
    f.controls.symbol.setValue('2w');
    expect(setupError(f.controls.name, 'a factor name')).toBe('Enter a factor name');
    expect(setupError(f.controls.symbol, 'a symbol')).toBe('Start with a letter, then letters, digits or _ (at most 24)');
  });

  it('puts the shared schema’s messages on the level that is wrong', () => {
    const list = new FormArray([factorGroup()]);
    const root = new FormGroup({ factors: list });
    const f = list.at(0);
    f.patchValue({ name: 'Notch-root radius', symbol: 'r', kind: 'numeric' });
    f.controls.levels.at(0).controls.value.setValue('0,5');
    f.controls.levels.at(1).controls.value.setValue('1.0');
    const check = applySchema(factorsBody, factorsValue(list), root);
    expect(check.ok).toBe(false);
    expect(setupError(f.controls.levels.at(0).controls.value, 'a level')).toBe('Level "0,5" of a numeric factor must be a number (use a point as decimal mark)');
    expect(f.controls.levels.at(1).controls.value.errors).toBeNull();
  });

  it('flags a symbol used twice on the second factor', () => {
    const list = new FormArray([factorGroup(), factorGroup()]);
    const root = new FormGroup({ factors: list });
    for (const g of list.controls) {
      g.patchValue({ name: 'x', symbol: 'w', kind: 'categorical' });
      g.controls.levels.at(0).controls.value.setValue('A');
      g.controls.levels.at(1).controls.value.setValue('B');
    }
    applySchema(factorsBody, factorsValue(list), root);
    expect(setupError(list.at(1).controls.symbol, 'a symbol')).toBe('Symbol "w" is used twice');
    expect(list.at(0).controls.symbol.errors).toBeNull();
  });

  it('asks a nominal-the-best response for its target, and a range to be ordered', () => {
    const list = new FormArray([responseGroup()]);
    const root = new FormGroup({ responses: list });
    list.at(0).patchValue({ name: 'Neck angle', symbol: 'psi', goal: 'nominal', rangeMin: '60', rangeMax: '30' });
    applySchema(responsesBody, responsesValue(list), root);
    expect(setupError(list.at(0).controls.target, 'a target')).toBe('A nominal-the-best response needs a target');
    expect(setupError(list.at(0).controls.rangeMax, 'an upper bound')).toBe('Plausible range: the maximum (30) must be above the minimum (60)');
  });

  it('refuses a comma in a number field right away', () => {
    const r = responseGroup();
    r.controls.rangeMin.setValue('0,5');
    expect(setupError(r.controls.rangeMin, 'a lower bound')).toBe('"0,5": use a point as the decimal mark');
  });

  it('reports "at least one valid outcome" above the list, where no single field owns it', () => {
    const list = new FormArray([outcomeGroup({ id: 3, position: 0, label: 'no neck', valid: false })]);
    const check = applySchema(outcomesBody, outcomesValue(list), new FormGroup({ outcomes: list }));
    expect(check).toEqual({ ok: false, unplaced: ['At least one outcome must be valid'] });
  });

  it('sends ids of existing items and drops empty level labels', () => {
    const g = factorGroup({ id: 4, position: 0, name: 'w', symbol: 'w', unit: '', kind: 'numeric', levels: [{ value: '0.3', label: 'narrow' }, { value: '0.6' }], tracksMeasured: true });
    expect(factorsValue(new FormArray([g])).factors[0]).toEqual({ id: 4, name: 'w', symbol: 'w', unit: '', kind: 'numeric', tracksMeasured: true, levels: [{ value: '0.3', label: 'narrow' }, { value: '0.6' }] });
  });
});

describe('study description form', () => {
  it('requires a title and says so', () => {
    const form = studyForm();
    expect(fieldError(form.controls.title, 'a title')).toBe('Enter a title');
  });

  it('checks thickness and orientation ranges with the limits of shared/studies.ts', () => {
    const form = studyForm();
    form.controls.thicknessMm.setValue('1,2');
    form.controls.orientationDeg.setValue('200');
    expect(fieldError(form.controls.thicknessMm, 'the thickness')).toBe('"1,2": use a point as the decimal mark');
    expect(fieldError(form.controls.orientationDeg, 'the orientation')).toBe('Enter a value from 0 to 180');
  });

  it('sends empty numbers as "not stated" (null)', () => {
    const form = studyForm();
    form.patchValue({ title: 'Strip study', thicknessMm: '1.20' });
    expect(studyBody(form)).toMatchObject({ title: 'Strip study', thicknessMm: 1.2, orientationDeg: null });
  });
});
