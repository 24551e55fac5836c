import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { RecommendationBody, RecommendationItem } from '../../../shared/analysis';
import { AnalysisApi, type StudyForAnalysis } from '../analysis/analysis-api';
import { ApiError } from '../core/api-error';

type Factor = StudyForAnalysis['factors'][number];

function settingGroup(f: Factor) {
  return new FormGroup({
    factor: new FormControl(f.symbol, { nonNullable: true }),
    level: new FormControl(f.levels[0]?.value ?? '', { nonNullable: true, validators: [Validators.required] }),
    toleranceMinus: new FormControl<number | null>(null, { validators: [Validators.min(0)] }),
    tolerancePlus: new FormControl<number | null>(null, { validators: [Validators.min(0)] }),
  });
}

/** Records the study's recommended geometry from an approved analysis: a level per factor, tolerance windows, a rationale. */
@Component({
  selector: 'sm-recommendation-form',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule],
  templateUrl: './recommendation-form.html',
  styleUrl: './recommendation-form.scss',
})
export class RecommendationForm {
  private readonly api = inject(AnalysisApi);
  readonly study = input.required<StudyForAnalysis>();
  readonly analysisId = input.required<number>();
  /** factor symbols the analysis covered; only those can be recommended from it */
  readonly factors = input.required<string[]>();
  readonly recorded = output<RecommendationItem>();

  protected readonly analysed = computed(() => this.study().factors.filter((f) => this.factors().includes(f.symbol)));
  protected readonly form = computed(
    () =>
      new FormGroup({
        settings: new FormArray(this.analysed().map(settingGroup)),
        rationale: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.minLength(10)] }),
      }),
  );
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected factorAt(i: number): Factor {
    return this.analysed()[i];
  }

  protected save(): void {
    const form = this.form();
    form.markAllAsTouched();
    if (form.invalid) return;
    const v = form.getRawValue();
    const body: RecommendationBody = {
      analysisId: this.analysisId(),
      rationale: v.rationale.trim(),
      settings: v.settings.map((s, i) => ({
        factor: s.factor,
        level: s.level,
        ...(this.factorAt(i).kind === 'numeric' && s.toleranceMinus !== null ? { toleranceMinus: s.toleranceMinus } : {}),
        ...(this.factorAt(i).kind === 'numeric' && s.tolerancePlus !== null ? { tolerancePlus: s.tolerancePlus } : {}),
      })),
    };
    this.busy.set(true);
    this.error.set(null);
    this.api.recordRecommendation(this.study().id, body).subscribe({
      next: (rec) => {
        this.busy.set(false);
        this.recorded.emit(rec);
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.error.set(e instanceof ApiError ? e.message : 'The recommendation could not be recorded.');
      },
    });
  }
}
