import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { AnovaRow, TukeyComparison } from '../../../shared/analysis';
import { formatNumber, formatP } from './format';
import { markSignificance } from './significance';

interface Comparison extends TukeyComparison {
  key: string;
  /** CI and zero as percentages across the strip drawn beside the numbers */
  left: number;
  width: number;
  dot: number;
  zero: number;
  significant: boolean;
}

interface TermBlock {
  term: string;
  label: string;
  comparisons: Comparison[];
}

/**
 * Tukey HSD comparisons (model residual MS and df) for the terms the ANOVA found significant. Beside
 * each row a strip shows the simultaneous CI of the difference against zero: a strip clear of the zero
 * mark is a difference the data support.
 */
@Component({
  selector: 'sm-posthoc-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './posthoc-panel.html',
  styleUrl: './posthoc-panel.scss',
})
export class PosthocPanel {
  readonly posthoc = input.required<{ term: string; comparisons: TukeyComparison[] }[]>();
  readonly anova = input.required<AnovaRow[]>();
  readonly alpha = input.required<number>();
  readonly names = input<Record<string, string>>({});
  readonly commentable = input(false);
  readonly comment = output<string>();

  protected readonly fmt = formatNumber;
  protected readonly fmtP = formatP;

  private readonly significantTerms = computed(() => new Set(this.anova().filter((r) => 'p' in r && r.p < this.alpha()).map((r) => r.source)));

  protected readonly blocks = computed<TermBlock[]>(() =>
    this.posthoc()
      .filter((b) => this.significantTerms().has(b.term))
      .map((b) => {
        const lo = Math.min(0, ...b.comparisons.map((c) => c.lower));
        const hi = Math.max(0, ...b.comparisons.map((c) => c.upper));
        const span = hi - lo || 1;
        const pct = (v: number) => ((v - lo) / span) * 100;
        return {
          term: b.term,
          label: b.term.split(':').map((s) => this.names()[s] ?? s).join(' × '),
          comparisons: b.comparisons.map((c) => ({
            ...c,
            key: `${c.b}-${c.a}`,
            left: pct(c.lower),
            width: Math.max(pct(c.upper) - pct(c.lower), 0.5),
            dot: pct(c.diff),
            zero: pct(0),
            significant: markSignificance(c.p, this.alpha()).significant,
          })),
        };
      }),
  );

  protected readonly skipped = computed(() => this.posthoc().filter((b) => !this.significantTerms().has(b.term)).map((b) => b.term));
}
