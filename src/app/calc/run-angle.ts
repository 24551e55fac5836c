import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, numberAttribute, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { HISTORY_COLUMNS, LENGTH_UNITS, type AngleFileInfo, type AngleMethod, type AngleProvenance, type AngleResultDto, type CalcStudyOverview, type HistoryColumn, type HistoryMapping } from '../../../shared/calc';
import { ColorScheme } from '../core/color-scheme';
import { Notifier } from '../core/notifier';
import { CalcApi } from './calc-api';
import { CalcCautions } from './cautions';
import { CalcChart } from './calc-chart';
import { angleOptions, DARK_PALETTE, LIGHT_PALETTE } from './chart-options';
import { FALLBACK_CAUTIONS, messageOf } from './hill-calculator';

export const COLUMN_LABELS: Record<HistoryColumn, string> = {
  frame: 'Frame or time',
  u1x: 'Point 1, displacement x',
  u1y: 'Point 1, displacement y',
  u2x: 'Point 2, displacement x',
  u2y: 'Point 2, displacement y',
};

/**
 * Relative-displacement angle of one run from two measuring points: upload the history, map its
 * columns, set the parameters, see the curve with its early maximum and plateau, and store one of them
 * as the run's response value. The server recomputes from the stored file when storing.
 */
@Component({
  selector: 'sm-run-angle',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, DecimalPipe, ReactiveFormsModule, RouterLink, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule, CalcChart, CalcCautions],
  templateUrl: './run-angle.html',
  styleUrl: './run-angle.scss',
})
export class RunAngle {
  /** Route parameters (component input binding). */
  readonly id = input.required({ transform: numberAttribute });
  readonly runId = input.required({ transform: numberAttribute });

  private readonly api = inject(CalcApi);
  private readonly scheme = inject(ColorScheme);
  private readonly notifier = inject(Notifier);
  protected readonly columns = HISTORY_COLUMNS;
  protected readonly columnLabels = COLUMN_LABELS;
  protected readonly lengthUnits = LENGTH_UNITS;
  protected readonly fallbackCautions = FALLBACK_CAUTIONS;

  protected readonly overview = signal<CalcStudyOverview | null>(null);
  protected readonly file = signal<AngleFileInfo | null>(null);
  protected readonly result = signal<AngleResultDto | null>(null);
  protected readonly failure = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly method = signal<AngleMethod>('plateau');

  protected readonly mappingForm = new FormGroup({
    frame: new FormControl('', { nonNullable: true, validators: Validators.required }),
    u1x: new FormControl('', { nonNullable: true, validators: Validators.required }),
    u1y: new FormControl('', { nonNullable: true, validators: Validators.required }),
    u2x: new FormControl('', { nonNullable: true, validators: Validators.required }),
    u2y: new FormControl('', { nonNullable: true, validators: Validators.required }),
    length: new FormControl<(typeof LENGTH_UNITS)[number]>('mm', { nonNullable: true }),
    frameUnit: new FormControl<'frame' | 's'>('frame', { nonNullable: true }),
  });
  protected readonly paramForm = new FormGroup({
    smoothingWindow: new FormControl(1, { nonNullable: true, validators: [Validators.required, Validators.min(1)] }),
    minRelativeDisplacement: new FormControl(0, { nonNullable: true, validators: [Validators.required, Validators.min(0)] }),
    plateauHalfBandDeg: new FormControl(1, { nonNullable: true, validators: [Validators.required, Validators.min(0.001)] }),
    minPlateauIncrements: new FormControl(5, { nonNullable: true, validators: [Validators.required, Validators.min(2)] }),
  });
  protected readonly responseControl = new FormControl('', { nonNullable: true, validators: Validators.required });
  protected readonly reasonControl = new FormControl('', { nonNullable: true });

  protected readonly run = computed(() => this.overview()?.runs.find((r) => r.runId === this.runId()) ?? null);
  protected readonly measuredResponses = computed(() => (this.overview()?.responses ?? []).filter((r) => r.derivation === null));
  protected readonly storedAngles = computed(() => {
    const run = this.run();
    if (!run) return [];
    return Object.entries(run.values)
      .filter(([, v]) => v.provenance?.kind === 'relative-displacement-angle')
      .map(([symbol, v]) => ({ symbol, text: v.text, provenance: v.provenance as AngleProvenance }));
  });
  protected readonly chartOptions = computed(() => {
    const r = this.result();
    return r && r.curve.length ? angleOptions(r, this.scheme.isDark() ? DARK_PALETTE : LIGHT_PALETTE) : null;
  });
  protected readonly chartLabel = computed(() => {
    const r = this.result();
    if (!r) return '';
    const max = r.maximum ? `early maximum ${r.maximum.angleDeg.toFixed(2)}°` : 'no maximum';
    const plateau = r.plateau ? `plateau ${r.plateau.meanAngleDeg.toFixed(2)}°` : 'no plateau';
    return `Angle from the loading axis against relative displacement; ${max}; ${plateau}`;
  });
  protected readonly chosenValue = computed(() => {
    const r = this.result();
    if (!r) return null;
    return this.method() === 'max' ? (r.maximum?.angleDeg ?? null) : (r.plateau?.meanAngleDeg ?? null);
  });

  constructor() {
    effect(() => this.load(this.id()));
  }

  private load(studyId: number): void {
    this.api.overview(studyId).subscribe({
      next: (o) => {
        this.overview.set(o);
        const angleLike = o.responses.find((r) => r.derivation === null && /ang|phi/i.test(r.symbol)) ?? o.responses.find((r) => r.derivation === null);
        if (angleLike && !this.responseControl.value) this.responseControl.setValue(angleLike.symbol);
        const last = this.storedAngles()[0];
        if (last && !this.file()) this.reopen(last.provenance);
      },
    });
  }

  /** Open the file and settings behind a stored value, so a re-computation starts from them. */
  private reopen(p: AngleProvenance): void {
    this.api.historyFile(this.id(), this.runId(), p.attachmentId).subscribe({
      next: ({ file }) => {
        this.file.set(file);
        this.mappingForm.patchValue({ ...p.mapping, length: p.units.length, frameUnit: p.units.frame });
        this.paramForm.patchValue(p.parameters);
        this.method.set(p.method);
        this.compute();
      },
    });
  }

  protected uploadFile(event: Event): void {
    const target = event.target as HTMLInputElement;
    const file = target.files?.[0];
    if (!file) return;
    this.busy.set(true);
    this.api.uploadHistory(this.id(), this.runId(), file).subscribe({
      next: ({ file: info }) => {
        this.busy.set(false);
        this.file.set(info);
        this.result.set(null);
        this.failure.set(null);
        this.mappingForm.patchValue({ frame: '', u1x: '', u1y: '', u2x: '', u2y: '', ...info.suggestedMapping });
        target.value = '';
        if (this.mappingForm.valid) this.compute();
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.failure.set(messageOf(e));
        target.value = '';
      },
    });
  }

  private body() {
    const f = this.file()!;
    const m = this.mappingForm.getRawValue();
    const mapping: HistoryMapping = { frame: m.frame, u1x: m.u1x, u1y: m.u1y, u2x: m.u2x, u2y: m.u2y };
    return { attachmentId: f.attachmentId, mapping, units: { length: m.length, frame: m.frameUnit }, parameters: this.paramForm.getRawValue() };
  }

  protected compute(): void {
    if (!this.file() || this.mappingForm.invalid || this.paramForm.invalid) {
      this.mappingForm.markAllAsTouched();
      this.paramForm.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.api.computeAngle(this.id(), this.runId(), this.body()).subscribe({
      next: ({ result }) => {
        this.busy.set(false);
        this.result.set(result);
        this.failure.set(null);
        if (!result.plateau && result.maximum) this.method.set('max');
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.result.set(null);
        this.failure.set(messageOf(e));
      },
    });
  }

  protected storeValue(): void {
    const run = this.run();
    if (!run || this.responseControl.invalid) {
      this.responseControl.markAsTouched();
      return;
    }
    this.busy.set(true);
    const reason = this.reasonControl.value.trim() || undefined;
    this.api.storeAngle(this.id(), this.runId(), { ...this.body(), method: this.method(), response: this.responseControl.value, version: run.version, reason }).subscribe({
      next: (out) => {
        this.busy.set(false);
        this.result.set(out.result);
        this.failure.set(null);
        this.overview.update((o) => (o ? { ...o, runs: o.runs.map((r) => (r.runId === out.run.runId ? out.run : r)) } : o));
        const what = out.changes.length ? `Stored ${this.responseControl.value} = ${out.run.values[this.responseControl.value]?.text}` : 'Value unchanged; its provenance was updated';
        this.notifier.info(`${what} for run ${out.run.code}.`);
        for (const w of out.warnings) this.notifier.info(w);
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.failure.set(messageOf(e));
        // A stale version (409) means someone else changed the run: reload it so the next try is current.
        this.load(this.id());
      },
    });
  }
}
