import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import type { HAssumptionBody, HFromAngleResult, Hill48Body, Hill48Result, NeckAngleResult } from '../../../shared/calc';
import { ApiError } from '../core/api-error';
import { ColorScheme } from '../core/color-scheme';
import { CalcApi } from './calc-api';
import { CalcCautions } from './cautions';
import { CalcChart } from './calc-chart';
import { DARK_PALETTE, LIGHT_PALETTE, locusOptions } from './chart-options';

const num = (value: number | null, ...extra: ReturnType<typeof Validators.min>[]) => new FormControl<number | null>(value, [Validators.required, ...extra]);

/** Angle convention shared by every neck relation on this page (server/calc/NECK-THEORY.md §2). */
export const ANGLE_CONVENTION =
  'Angles in degrees from the loading axis x, counter-clockwise positive; y is the in-plane transverse axis. ' +
  'θ is the neck line, φ the direction in which the material on the +x side of the neck moves relative to the −x side.';

/** The issue-7 cautions, for the moment before any server answer has arrived. */
export const FALLBACK_CAUTIONS: readonly string[] = [
  'Notched and grooved strips are not standard tensile specimens: values derived here are not equivalent to r-values measured to the applicable test standard.',
  'The theory assumes a thin sheet, a rigid-plastic material and uniform stress along the neck; results inform, and do not replace, qualified engineering judgement.',
];

/**
 * Hill 1948 calculator: Lankford coefficients ↔ F, G, H, N, the yield locus beside von Mises, the
 * free neck in tension along RD, an imposed neck's relative-displacement angle, and H solved from a
 * measured angle. All numbers come from the server engine; this page only collects inputs and shows
 * results, their assumptions and refusals.
 */
@Component({
  selector: 'sm-hill-calculator',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DecimalPipe, ReactiveFormsModule, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatIconModule, MatInputModule, MatRadioModule, CalcChart, CalcCautions],
  templateUrl: './hill-calculator.html',
  styleUrl: './hill-calculator.scss',
})
export class HillCalculator {
  private readonly api = inject(CalcApi);
  private readonly scheme = inject(ColorScheme);
  protected readonly convention = ANGLE_CONVENTION;
  /** Shown until the first result brings the server's own list. */
  protected readonly fallbackCautions = FALLBACK_CAUTIONS;

  protected readonly mode = signal<'lankford' | 'coefficients'>('lankford');
  protected readonly lankfordForm = new FormGroup({ r0: num(1.8, Validators.min(0)), r45: num(1.3, Validators.min(0)), r90: num(2.2, Validators.min(0)) });
  protected readonly coefficientForm = new FormGroup({ F: num(0.5), G: num(0.5), H: num(0.5), N: num(1.5) });
  protected readonly neckForm = new FormGroup({ theta: num(60, Validators.min(0), Validators.max(180)), alpha: num(0) });
  protected readonly inverseForm = new FormGroup({
    theta: num(60, Validators.min(0), Validators.max(180)),
    phi: num(30, Validators.min(-90), Validators.max(90)),
    alpha: num(0),
    assumption: new FormControl<'normal-anisotropy' | 'given-FGN'>('normal-anisotropy', { nonNullable: true }),
  });

  protected readonly hill = signal<Hill48Result | null>(null);
  protected readonly hillError = signal<string | null>(null);
  protected readonly neck = signal<NeckAngleResult | null>(null);
  protected readonly neckError = signal<string | null>(null);
  protected readonly inverse = signal<HFromAngleResult | null>(null);
  protected readonly inverseError = signal<string | null>(null);
  protected readonly busy = signal(false);

  protected readonly chartOptions = computed(() => {
    const r = this.hill();
    return r ? locusOptions(r, this.scheme.isDark() ? DARK_PALETTE : LIGHT_PALETTE) : null;
  });
  protected readonly chartLabel = computed(() => {
    const r = this.hill();
    if (!r) return '';
    const c = r.coefficients;
    return `Yield loci in the σ1–σ2 plane: Hill 1948 with F ${c.F.toFixed(3)}, G ${c.G.toFixed(3)}, H ${c.H.toFixed(3)} (solid) and von Mises (dashed)`;
  });
  protected readonly lociCoincide = computed(() => {
    const r = this.hill();
    return !!r && r.locus.hill.every((p, i) => Math.hypot(p.s1 - r.locus.vonMises[i]!.s1, p.s2 - r.locus.vonMises[i]!.s2) < 1e-9);
  });
  protected readonly freeNeckLabel = computed(() => {
    const f = this.hill()?.freeNeck;
    return f ? `${f.neckAnglesDeg[0].toFixed(2)}°` : null;
  });

  constructor() {
    this.calculate();
  }

  protected chooseMode(mode: 'lankford' | 'coefficients'): void {
    const r = this.hill();
    // Carry the current result across so switching the input side does not lose the material.
    if (r && mode === 'coefficients') this.coefficientForm.setValue({ ...r.coefficients });
    if (r?.lankford && mode === 'lankford') this.lankfordForm.setValue({ ...r.lankford });
    this.mode.set(mode);
  }

  /** Lankford ↔ Hill, locus and free neck from whichever side is being entered. */
  protected calculate(): void {
    const form = this.mode() === 'lankford' ? this.lankfordForm : this.coefficientForm;
    if (form.invalid) {
      form.markAllAsTouched();
      return;
    }
    const body: Hill48Body =
      this.mode() === 'lankford'
        ? { from: 'lankford', lankford: { r0: this.lankfordForm.value.r0!, r45: this.lankfordForm.value.r45!, r90: this.lankfordForm.value.r90! } }
        : { from: 'coefficients', coefficients: { F: this.coefficientForm.value.F!, G: this.coefficientForm.value.G!, H: this.coefficientForm.value.H!, N: this.coefficientForm.value.N! } };
    this.busy.set(true);
    this.api.hill48(body).subscribe({
      next: (r) => {
        this.hill.set(r);
        this.hillError.set(null);
        this.busy.set(false);
        this.neck.set(null);
        this.inverse.set(null);
      },
      error: (e: unknown) => {
        this.hill.set(null);
        this.hillError.set(messageOf(e));
        this.busy.set(false);
      },
    });
  }

  /** Imposed neck θ → φ for the current coefficients. */
  protected predictAngle(): void {
    const r = this.hill();
    if (!r || this.neckForm.invalid) {
      this.neckForm.markAllAsTouched();
      return;
    }
    const v = this.neckForm.getRawValue();
    this.api.neckAngle({ coefficients: r.coefficients, neckAngleDeg: v.theta!, loadAngleDeg: v.alpha! }).subscribe({
      next: (res) => {
        this.neck.set(res);
        this.neckError.set(null);
      },
      error: (e: unknown) => {
        this.neck.set(null);
        this.neckError.set(messageOf(e));
      },
    });
  }

  /** Measured φ at θ → H, with F, G, N of the current coefficients or normal anisotropy. */
  protected solveH(): void {
    if (this.inverseForm.invalid) {
      this.inverseForm.markAllAsTouched();
      return;
    }
    const v = this.inverseForm.getRawValue();
    const c = this.hill()?.coefficients;
    if (v.assumption === 'given-FGN' && !c) {
      this.inverseError.set('Calculate a coefficient set first: its F, G and N are the ones held fixed.');
      return;
    }
    const assumption: HAssumptionBody = v.assumption === 'given-FGN' && c ? { kind: 'given-FGN', F: c.F, G: c.G, N: c.N } : { kind: 'normal-anisotropy' };
    this.api.hFromAngle({ neckAngleDeg: v.theta!, relativeDisplacementAngleDeg: v.phi!, loadAngleDeg: v.alpha!, assumption }).subscribe({
      next: (res) => {
        this.inverse.set(res);
        this.inverseError.set(null);
      },
      error: (e: unknown) => {
        this.inverse.set(null);
        this.inverseError.set(messageOf(e));
      },
    });
  }
}

export function messageOf(e: unknown): string {
  return e instanceof ApiError ? e.message : 'The calculation could not be run; try again.';
}
