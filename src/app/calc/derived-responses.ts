import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, numberAttribute, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import type { CalcStudyOverview, DerivedHPreviewBody, DerivedHResultDto } from '../../../shared/calc';
import { Notifier } from '../core/notifier';
import { CalcApi } from './calc-api';
import { CalcCautions } from './cautions';
import { FALLBACK_CAUTIONS, messageOf } from './hill-calculator';

/**
 * A study's derived responses: per run, a link to the angle calculation and the angle stored so far;
 * and the "estimated H per run" derivation, previewed and then stored as a response of its own that
 * the analysis uses like any other. Runs without a solution are listed with the reason.
 */
@Component({
  selector: 'sm-derived-responses',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DecimalPipe, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatRadioModule, MatSelectModule, CalcCautions],
  templateUrl: './derived-responses.html',
  styleUrl: './run-angle.scss',
})
export class DerivedResponses {
  readonly id = input.required({ transform: numberAttribute });
  private readonly api = inject(CalcApi);
  private readonly notifier = inject(Notifier);
  protected readonly fallbackCautions = FALLBACK_CAUTIONS;

  protected readonly overview = signal<CalcStudyOverview | null>(null);
  protected readonly preview = signal<DerivedHResultDto | null>(null);
  protected readonly failure = signal<string | null>(null);
  protected readonly busy = signal(false);

  protected readonly form = new FormGroup({
    angleResponse: new FormControl('', { nonNullable: true, validators: Validators.required }),
    neckSource: new FormControl<'factor' | 'fixed'>('factor', { nonNullable: true }),
    neckFactor: new FormControl('', { nonNullable: true }),
    neckFixed: new FormControl<number | null>(null),
    loadAngleDeg: new FormControl<number | null>(null),
    assumption: new FormControl<'normal-anisotropy' | 'given-FGN'>('normal-anisotropy', { nonNullable: true }),
    F: new FormControl<number | null>(null),
    G: new FormControl<number | null>(null),
    N: new FormControl<number | null>(null),
    targetSymbol: new FormControl('Hest', { nonNullable: true, validators: [Validators.required, Validators.pattern(/^[A-Za-z][A-Za-z0-9_]{0,23}$/)] }),
  });

  protected readonly measured = computed(() => (this.overview()?.responses ?? []).filter((r) => r.derivation === null));
  protected readonly derived = computed(() => (this.overview()?.responses ?? []).filter((r) => r.derivation !== null));
  protected readonly numericFactors = computed(() => (this.overview()?.factors ?? []).filter((f) => f.kind === 'numeric'));
  protected readonly rows = computed(() => {
    const o = this.overview();
    if (!o) return [];
    return o.runs.map((r) => {
      const angle = Object.entries(r.values).find(([, v]) => v.provenance?.kind === 'relative-displacement-angle');
      return { runId: r.runId, code: r.code, excluded: r.excluded, angle: angle ? `${angle[0]} = ${angle[1].text}°` : null, derived: this.derived().map((d) => r.values[d.symbol]?.text ?? '—') };
    });
  });
  protected readonly withoutValue = computed(() => (this.preview()?.estimates ?? []).filter((e) => e.H === null).length);

  constructor() {
    effect(() => this.load(this.id()));
  }

  private load(studyId: number): void {
    this.api.overview(studyId).subscribe({
      next: (o) => {
        this.overview.set(o);
        const f = this.form.controls;
        if (!f.angleResponse.value) f.angleResponse.setValue(o.responses.find((r) => r.derivation === null && /ang|phi/i.test(r.symbol))?.symbol ?? '');
        if (!f.neckFactor.value) f.neckFactor.setValue(o.factors.find((x) => x.kind === 'numeric' && /theta|neck|angle/i.test(`${x.symbol} ${x.name}`))?.symbol ?? '');
        if (!f.neckFactor.value) f.neckSource.setValue('fixed');
        if (f.loadAngleDeg.value === null) f.loadAngleDeg.setValue(o.orientationDeg ?? 0);
      },
    });
  }

  private body(): DerivedHPreviewBody | null {
    const v = this.form.getRawValue();
    if (!v.angleResponse) return null;
    const neckAngle = v.neckSource === 'factor' ? { kind: 'factor' as const, symbol: v.neckFactor } : { kind: 'fixed' as const, valueDeg: v.neckFixed ?? Number.NaN };
    const assumption = v.assumption === 'given-FGN' ? { kind: 'given-FGN' as const, F: v.F ?? Number.NaN, G: v.G ?? Number.NaN, N: v.N ?? Number.NaN } : { kind: 'normal-anisotropy' as const };
    return { angleResponse: v.angleResponse, neckAngle, loadAngleDeg: v.loadAngleDeg ?? undefined, assumption };
  }

  protected previewH(): void {
    const body = this.body();
    if (!body) {
      this.form.markAllAsTouched();
      return;
    }
    this.api.previewDerivedH(this.id(), body).subscribe({
      next: ({ result }) => {
        this.preview.set(result);
        this.failure.set(null);
      },
      error: (e: unknown) => {
        this.preview.set(null);
        this.failure.set(messageOf(e));
      },
    });
  }

  protected storeH(): void {
    const body = this.body();
    if (!body || this.form.controls.targetSymbol.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.api.storeDerivedH(this.id(), { ...body, target: { symbol: this.form.controls.targetSymbol.value, name: 'Estimated H (derived)' } }).subscribe({
      next: (out) => {
        this.busy.set(false);
        this.preview.set(out.result);
        this.failure.set(null);
        this.notifier.info(`Derived response ${this.form.controls.targetSymbol.value}: ${out.changes.length} value change(s) written.`);
        this.load(this.id());
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.failure.set(messageOf(e));
      },
    });
  }
}
