import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import type { AnalysisSpecInput, PreviewResponse, StoredResult } from '../../../shared/analysis';
import { ApiError } from '../core/api-error';
import { Notifier } from '../core/notifier';
import { routeStudyId } from './study-route';
import { StudyStore } from '../studies/study-store';
import { AnalysisApi } from './analysis-api';
import { factorNames, maySave, responseLabel } from './analysis-labels';
import { AnalysisResults } from './analysis-results';
import { ModelForm } from './model-form';
import { RunCounts } from './run-counts';

/** The analysis workspace of one study: model choices on the left, the server's live result on the right. */
@Component({
  selector: 'sm-analysis-workspace',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, FormsModule, MatButtonModule, MatIconModule, MatFormFieldModule, MatInputModule, MatProgressBarModule, ModelForm, RunCounts, AnalysisResults],
  templateUrl: './analysis-workspace.html',
  styleUrl: './analysis-workspace.scss',
})
export class AnalysisWorkspace {
  private readonly api = inject(AnalysisApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);
  /** Saving moves a collecting study to analysed; the study header above this tab shows that. */
  private readonly studyStore = inject(StudyStore, { optional: true });
  protected readonly studyId = routeStudyId();

  protected readonly study = rxResource({ params: () => this.studyId(), stream: ({ params }) => this.api.study(params) });
  private readonly settings = rxResource({ params: () => this.studyId(), stream: ({ params }) => this.api.runSettings(params) });
  protected readonly rowSettings = computed(() => (this.settings.hasValue() ? this.settings.value() : null));

  protected readonly spec = signal<AnalysisSpecInput | null>(null);
  protected readonly preview = rxResource<PreviewResponse, { studyId: number; spec: AnalysisSpecInput } | undefined>({
    params: () => {
      const spec = this.spec();
      return spec ? { studyId: this.studyId(), spec } : undefined;
    },
    stream: ({ params }) => this.api.preview(params.studyId, params.spec),
  });
  /** The last good result stays on screen while the next one is computed, so the page does not flicker. */
  protected readonly shown = linkedSignal<{ value: PreviewResponse | undefined; failed: boolean }, PreviewResponse | null>({
    source: () => ({ value: this.preview.hasValue() ? this.preview.value() : undefined, failed: this.preview.status() === 'error' }),
    computation: (now, previous) => now.value ?? (now.failed ? null : (previous?.value ?? null)),
  });
  protected readonly bundle = computed<StoredResult | null>(() => {
    const p = this.shown();
    return p ? { engine: p.result, counts: p.counts, summary: p.summary, readings: p.readings, rowCodes: p.rowCodes, posthoc: p.posthoc } : null;
  });
  protected readonly previewError = computed(() => {
    const e = this.preview.error();
    return e instanceof ApiError ? e.message : e ? 'The analysis could not be computed.' : null;
  });

  protected readonly names = computed(() => factorNames(this.study.value()));
  protected readonly responseLabel = computed(() => responseLabel(this.study.value(), this.spec()?.response ?? ''));
  protected readonly alpha = computed(() => this.spec()?.alpha ?? 0.05);
  protected readonly maySave = computed(() => maySave(this.study.value()));

  protected title = '';
  protected readonly saving = signal(false);

  protected saveAnalysis(): void {
    const spec = this.spec();
    if (!spec) return;
    this.saving.set(true);
    const title = this.title.trim();
    this.api.save(this.studyId(), { ...spec, ...(title ? { title } : {}) }).subscribe({
      next: (a) => {
        this.notifier.info(`Saved “${a.title}”.`);
        this.studyStore?.reload();
        void this.router.navigate(['/studies', a.studyId, 'analyses', a.id]);
      },
      // The interceptor has shown the failure; the button becomes usable again.
      error: () => this.saving.set(false),
    });
  }
}
