import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import type { AnalysisResult } from '../../../shared/analysis';
import { ColorScheme } from '../core/color-scheme';
import { ChartCard } from './chart-card';
import { type SpreadMetric, dispersionOption } from './chart-diagnostics';
import { chartTheme } from './chart-theme';
import { formatNumber, formatP } from './format';

function keyLabel(key: Record<string, string>): string {
  return Object.entries(key)
    .map(([f, l]) => `${f}=${l}`)
    .join(', ');
}

/**
 * Dispersion: which factor drives the scatter, signal-to-noise per setting, and the settings ranked by
 * the engine's loss rule (on target and low scatter at once). The chart shows SD or ln s² per setting.
 */
@Component({
  selector: 'sm-dispersion-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonToggleModule, MatIconModule, ChartCard],
  templateUrl: './dispersion-panel.html',
  styleUrl: './dispersion-panel.scss',
})
export class DispersionPanel {
  private readonly scheme = inject(ColorScheme);
  readonly result = input.required<AnalysisResult>();
  readonly alpha = input.required<number>();
  readonly commentable = input(false);
  readonly commentCounts = input<Record<string, number>>({});
  readonly comment = output<string>();

  protected readonly fmt = formatNumber;
  protected readonly fmtP = formatP;
  protected readonly metric = signal<SpreadMetric>('sd');
  protected readonly theme = computed(() => chartTheme(this.scheme.isDark()));

  protected countFor(chartId: string): number {
    return this.commentCounts()[`chart:${chartId}`] ?? 0;
  }

  protected readonly option = computed(() =>
    dispersionOption(
      this.result().descriptives.byCell.map((c) => ({ label: c.label, n: c.n, mean: c.mean, sd: c.sd })),
      this.metric(),
      this.theme(),
    ),
  );

  protected readonly chartHeight = computed(() => Math.max(220, this.result().descriptives.byCell.length * 26 + 70));
  protected readonly singleRun = computed(() => this.result().descriptives.byCell.filter((c) => c.sd === null).map((c) => c.label));

  /** Per factor: the spread tests on within-cell deviations; the factor with the smallest p is marked when below α. */
  protected readonly drivers = computed(() => {
    const tests = this.result().dispersion?.varianceTests ?? [];
    const best = tests.reduce<string | null>((acc, t) => {
      const p = t.brownForsythe?.p ?? t.levene?.p ?? 1;
      const accP = tests.find((x) => x.factor === acc)?.brownForsythe?.p ?? 1;
      return p < this.alpha() && (acc === null || p < accP) ? t.factor : acc;
    }, null);
    return tests.map((t) => ({ ...t, drives: t.factor === best }));
  });

  protected readonly cells = computed(() => (this.result().dispersion?.cells ?? []).map((c) => ({ ...c, label: keyLabel(c.key) })));
  protected readonly ranking = computed(() =>
    (this.result().dispersion?.ranking ?? []).filter((r) => r.rank !== null).slice(0, 8).map((r) => ({ ...r, label: keyLabel(r.key) })),
  );
  protected readonly rule = computed(() => this.result().dispersion?.rankingRule ?? '');
  protected readonly hasEngineDispersion = computed(() => this.result().dispersion !== undefined);
}
