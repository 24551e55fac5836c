import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { StoredResult } from '../../../shared/analysis';
import { AnalysisCharts } from './analysis-charts';
import { AnovaTable } from './anova-table';
import { AssumptionsPanel } from './assumptions-panel';
import { CautionNote } from './caution-note';
import { DescriptivesPanel } from './descriptives-panel';
import { DispersionPanel } from './dispersion-panel';
import { PosthocPanel } from './posthoc-panel';
import { ResultPanel } from './result-panel';

/**
 * Every panel of one analysis result, in the order a reviewer reads it: summary, ANOVA, notes,
 * assumptions, post-hoc, charts, dispersion, descriptives. Used live (workspace) and frozen (saved view).
 */
@Component({
  selector: 'sm-analysis-results',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule, ResultPanel, AnovaTable, AssumptionsPanel, PosthocPanel, DispersionPanel, DescriptivesPanel, AnalysisCharts, CautionNote],
  templateUrl: './analysis-results.html',
  styles: `
    :host {
      display: grid;
      grid-template-columns: minmax(0, 1fr);
      gap: 16px;
      min-width: 0;
    }
    .summary {
      font: var(--mat-sys-body-large);
      max-width: 95ch;
      margin: 0;
    }
    .notes {
      margin: 0;
      padding-left: 20px;
      display: grid;
      gap: 4px;
    }
    .model {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
      margin: 10px 0 0;
    }
  `,
})
export class AnalysisResults {
  readonly bundle = input.required<StoredResult>();
  readonly alpha = input.required<number>();
  readonly names = input<Record<string, string>>({});
  readonly responseLabel = input.required<string>();
  readonly rowSettings = input<Map<string, Record<string, string>> | null>(null);
  readonly commentable = input(false);
  readonly commentCounts = input<Record<string, number>>({});
  readonly comment = output<string>();

  protected readonly r = computed(() => this.bundle().engine);
  /** Results stored before the server added the per-term Tukey list carry it inside the engine result only. */
  protected readonly posthoc = computed(() => (this.bundle() as Partial<StoredResult>).posthoc ?? this.r().posthoc ?? []);
  protected readonly notes = computed(() => [...this.r().notes, ...this.r().omitted.map((o) => `${o.source} is not estimated: ${o.reason}`)]);
  protected readonly rSquared = computed(() => this.r().model.rSquared.toFixed(3));
  protected readonly residualSd = computed(() => Number(this.r().model.residualSd.toPrecision(4)));
}
