import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { EChartsCoreOption } from 'echarts/core';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { Hill48Result } from '../../../shared/calc';
import { errorInterceptor } from '../core/error-interceptor';
import { Notifier } from '../core/notifier';
import { CalcChart } from './calc-chart';
import { HillCalculator } from './hill-calculator';

/** Stands in for the echarts wrapper: jsdom has no layout, and the options are what this page owns. */
@Component({ selector: 'sm-calc-chart', changeDetection: ChangeDetectionStrategy.OnPush, template: '<div data-testid="stub-chart">{{ label() }}</div>' })
class StubChart {
  readonly options = input.required<EChartsCoreOption>();
  readonly label = input.required<string>();
  readonly height = input<number | null>(380);
  readonly aspectRatio = input<number | null>(null);
}

const PSI = (Math.atan(Math.SQRT2) * 180) / Math.PI; // arctan √2 = 54.7356° (Hill 1952, isotropic free neck)

/** What the server answers for r0 = r45 = r90 = 1 (isotropy: F = G = H = 1/2, N = 3/2, Hill 1948). */
function isotropicAnswer(): Hill48Result {
  const circle = Array.from({ length: 9 }, (_, i) => ({ s1: Math.cos((i * Math.PI) / 4), s2: Math.sin((i * Math.PI) / 4) }));
  return {
    calcVersion: 'calc-test',
    coefficients: { F: 0.5, G: 0.5, H: 0.5, N: 1.5 },
    lankford: { r0: 1, r45: 1, r90: 1 },
    locus: { hill: circle, vonMises: circle, keyPoints: { uniaxialTD: 1, equibiaxial: 1, planeStrainRD: { s1: 1.1547, s2: 0.5774 } }, normalisation: 'σ0 = RD yield' },
    freeNeck: { neckAnglesDeg: [PSI, -PSI], relativeDisplacementAnglesDeg: [90 - PSI, PSI - 90] },
    freeNeckRefusal: null,
    assumptions: ['Plane stress (σ3 = 0) in a thin sheet.'],
    cautions: ['Notched and grooved strips are not standard tensile specimens.'],
  };
}

describe('HillCalculator', () => {
  let fixture: ComponentFixture<HillCalculator>;
  let backend: HttpTestingController;
  let el: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [HillCalculator],
      providers: [provideRouter([]), provideHttpClient(withInterceptors([errorInterceptor])), provideHttpClientTesting(), { provide: Notifier, useValue: { error: vi.fn(), info: vi.fn() } }],
    });
    TestBed.overrideComponent(HillCalculator, { remove: { imports: [CalcChart] }, add: { imports: [StubChart] } });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(HillCalculator);
    el = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
  });
  afterEach(() => backend.verify());

  const input = (name: string) => el.querySelector<HTMLInputElement>(`input[name=${name}]`)!;
  async function type(name: string, value: string): Promise<void> {
    input(name).value = value;
    input(name).dispatchEvent(new Event('input'));
    input(name).dispatchEvent(new Event('blur'));
    await fixture.whenStable();
  }
  const calculate = async () => {
    el.querySelector<HTMLButtonElement>('form button[type=submit]')!.click();
    await fixture.whenStable();
  };

  it('sends the entered r-values and shows the free neck, the coefficients, the chart and the cautions', async () => {
    backend.expectOne('/api/calc/hill48').flush(isotropicAnswer());
    for (const k of ['r0', 'r45', 'r90']) await type(k, '1');
    await calculate();
    const req = backend.expectOne('/api/calc/hill48');
    expect(req.request.body).toEqual({ from: 'lankford', lankford: { r0: 1, r45: 1, r90: 1 } });
    req.flush(isotropicAnswer());
    await fixture.whenStable();
    expect(el.querySelector('[data-testid=free-neck-angle]')?.textContent?.trim()).toBe('54.74°');
    expect(el.querySelector('[data-testid=coefficients]')?.textContent).toContain('0.5000, 0.5000, 0.5000, 1.5000');
    expect(el.querySelector('[data-testid=stub-chart]')?.textContent).toContain('von Mises');
    expect(el.querySelector('[data-testid=calc-cautions]')?.textContent).toContain('not standard tensile specimens');
    expect(el.querySelector('[data-testid=angle-convention]')?.textContent).toContain('counter-clockwise positive');
  });

  it('shows the server refusal beside the inputs and drops the old result', async () => {
    backend.expectOne('/api/calc/hill48').flush(isotropicAnswer());
    await fixture.whenStable();
    await type('r0', '0');
    await calculate();
    backend.expectOne('/api/calc/hill48').flush({ message: 'r0 = 0 is not admissible (a Lankford coefficient must be > 0)' }, { status: 400, statusText: 'Bad Request' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid=hill-error]')?.textContent).toContain('r0 = 0 is not admissible');
    expect(el.querySelector('[data-testid=free-neck-angle]')).toBeNull();
  });

  it('sends nothing while a field is empty, and says which one', async () => {
    backend.expectOne('/api/calc/hill48').flush(isotropicAnswer());
    await type('r45', '');
    await calculate();
    backend.expectNone('/api/calc/hill48');
    expect(Array.from(el.querySelectorAll('mat-error')).map((e) => e.textContent?.trim())).toEqual(['Enter r45 > 0']);
  });

  it('solves H under normal anisotropy with the entered angles', async () => {
    backend.expectOne('/api/calc/hill48').flush(isotropicAnswer());
    await fixture.whenStable();
    await type('inverse-theta', String(PSI));
    await type('inverse-phi', String(90 - PSI));
    el.querySelectorAll<HTMLButtonElement>('button[type=submit]').forEach((b) => b.textContent?.includes('Solve H') && b.click());
    await fixture.whenStable();
    const req = backend.expectOne('/api/calc/h-from-angle');
    expect(req.request.body).toEqual({ neckAngleDeg: PSI, relativeDisplacementAngleDeg: 90 - PSI, loadAngleDeg: 0, assumption: { kind: 'normal-anisotropy' } });
    req.flush({ calcVersion: 'calc-test', assumption: { kind: 'normal-anisotropy' }, H: 0.5, coefficients: { F: 0.5, G: 0.5, H: 0.5, N: 1.5 }, r: 1, lankford: { r0: 1, r45: 1, r90: 1 }, admissibleAngleRangeDeg: [26.57, 54.74], assumptions: [], cautions: [] });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid=solved-h]')?.textContent).toContain('H = 0.5000');
  });
});
