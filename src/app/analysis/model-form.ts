import { ChangeDetectionStrategy, Component, computed, effect, input } from '@angular/core';
import { outputFromObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { debounceTime, distinctUntilChanged, filter, map } from 'rxjs';
import { type AnalysisSpecInput, defaultTerms } from '../../../shared/analysis';
import type { StudyForAnalysis } from './analysis-api';
import { interactionChoices } from './model-terms';

type SsType = 1 | 2 | 3;

/**
 * The model choices: response, factors, interactions, SS type, α and the exclusion of invalid runs.
 * Emits a complete spec a moment after the last change (so typing and clicking through do not send a
 * request per click), and only when it differs from the last one sent.
 */
@Component({
  selector: 'sm-model-form',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, MatFormFieldModule, MatSelectModule, MatCheckboxModule, MatRadioModule, MatSlideToggleModule, MatIconModule],
  templateUrl: './model-form.html',
  styleUrl: './model-form.scss',
})
export class ModelForm {
  readonly study = input.required<StudyForAnalysis>();

  protected readonly form = new FormGroup({
    response: new FormControl('', { nonNullable: true }),
    factors: new FormControl<string[]>([], { nonNullable: true }),
    interactions: new FormControl<string[]>([], { nonNullable: true }),
    ssType: new FormControl<SsType>(2, { nonNullable: true }),
    alpha: new FormControl(0.05, { nonNullable: true }),
    excludeInvalid: new FormControl(true, { nonNullable: true }),
  });
  protected readonly alphaChoices = [0.01, 0.05, 0.1];

  private readonly value = toSignal(this.form.valueChanges.pipe(map(() => this.form.getRawValue())), { initialValue: this.form.getRawValue() });
  protected readonly chosenFactors = computed(() => this.value().factors);
  protected readonly interactionOptions = computed(() => interactionChoices(this.chosenFactors()));
  protected readonly ssType = computed(() => this.value().ssType);

  readonly specChange = outputFromObservable(
    this.form.valueChanges.pipe(
      map(() => this.form.getRawValue()),
      filter((v) => v.response !== '' && v.factors.length > 0),
      debounceTime(250),
      map(
        (v): AnalysisSpecInput => ({
          response: v.response,
          factors: v.factors,
          terms: [...v.factors, ...v.interactions.filter((t) => t.split(':').every((f) => v.factors.includes(f)))],
          ssType: v.ssType,
          alpha: v.alpha,
          excludeInvalid: v.excludeInvalid,
        }),
      ),
      distinctUntilChanged((a, b) => JSON.stringify(a) === JSON.stringify(b)),
    ),
  );

  constructor() {
    // First choices once the study is known: the first response, up to three factors, the default terms.
    effect(() => {
      const s = this.study();
      if (this.form.controls.response.value !== '') return;
      const factors = s.factors.slice(0, 3).map((f) => f.symbol);
      this.form.setValue({
        response: s.responses[0]?.symbol ?? '',
        factors,
        interactions: defaultTerms(factors).filter((t) => t.includes(':')),
        ssType: 2,
        alpha: 0.05,
        excludeInvalid: true,
      });
    });
  }

  protected isChosen(symbol: string): boolean {
    return this.chosenFactors().includes(symbol);
  }

  /** Toggling a factor keeps model order (study order) and resets interactions to every pair: the default model. */
  protected toggleFactor(symbol: string, on: boolean): void {
    const order = this.study().factors.map((f) => f.symbol);
    const current = new Set(this.form.controls.factors.value);
    if (on) current.add(symbol);
    else current.delete(symbol);
    const factors = order.filter((f) => current.has(f));
    this.form.patchValue({ factors, interactions: defaultTerms(factors).filter((t) => t.includes(':')) });
  }

  protected isTermChosen(term: string): boolean {
    return this.value().interactions.includes(term);
  }

  protected toggleTerm(term: string, on: boolean): void {
    const current = this.form.controls.interactions.value.filter((t) => t !== term);
    const options = this.interactionOptions();
    const next = on ? [...current, term] : current;
    this.form.controls.interactions.setValue(options.filter((o) => next.includes(o)));
  }
}
