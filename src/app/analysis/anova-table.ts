import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatTooltipModule } from '@angular/material/tooltip';
import type { AnovaRow, OmittedTerm } from '../../../server/stats/types';
import { formatNumber, formatP } from './format';
import { type SignificanceMark, markSignificance } from './significance';

interface AnovaLine {
  source: string;
  label: string;
  df: number;
  ss: string;
  ms: string;
  f: string;
  p: string;
  eta: string;
  mark: SignificanceMark;
  residual: boolean;
}

/**
 * The ANOVA table. Significant terms carry an icon, the word "Significant" and bold figures, so the
 * marking survives greyscale printing and colour-vision deficiency; the tint is only a third cue.
 */
@Component({
  selector: 'sm-anova-table',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatIconModule, MatTooltipModule],
  templateUrl: './anova-table.html',
  styleUrl: './anova-table.scss',
})
export class AnovaTable {
  readonly rows = input.required<AnovaRow[]>();
  readonly omitted = input<OmittedTerm[]>([]);
  readonly alpha = input.required<number>();
  /** factor symbol -> name, for the source column */
  readonly names = input<Record<string, string>>({});
  readonly commentable = input(false);
  readonly commentCounts = input<Record<string, number>>({});
  readonly comment = output<string>();

  protected readonly lines = computed<AnovaLine[]>(() =>
    this.rows().map((r) => {
      const residual = r.source === 'Residual';
      const effect = 'f' in r ? r : null;
      return {
        source: r.source,
        label: residual ? 'Residual' : r.source.split(':').map((s) => this.names()[s] ?? s).join(' × '),
        df: r.df,
        ss: formatNumber(r.ss),
        ms: formatNumber(r.ms),
        f: effect ? formatNumber(effect.f) : '',
        p: effect ? formatP(effect.p) : '',
        eta: effect ? formatNumber(effect.partialEtaSq, 3) : '',
        mark: markSignificance(effect?.p ?? null, this.alpha()),
        residual,
      };
    }),
  );

  protected countFor(source: string): number {
    return this.commentCounts()[`anova:${source}`] ?? 0;
  }
}
