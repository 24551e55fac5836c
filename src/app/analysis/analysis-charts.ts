import { ChangeDetectionStrategy, Component, computed, inject, input, output } from '@angular/core';
import type { AnalysisResult, AnovaEffectRow } from '../../../shared/analysis';
import { ColorScheme } from '../core/color-scheme';
import { ChartCard } from './chart-card';
import { boxPlotOption, qqOption, residualsOption } from './chart-diagnostics';
import type { ChartOption } from './chart-kit';
import { type InteractionInput, interactionOption, mainEffectsOption, mirrored } from './chart-means';
import { chartTheme } from './chart-theme';
import { formatNumber, pPhrase } from './format';

interface CardSpec {
  id: string;
  title: string;
  caption: string;
  option: ChartOption;
  height: number;
  wide: boolean;
}

/** Every chart of one result, in reading order; colours follow the light/dark choice. */
@Component({
  selector: 'sm-analysis-charts',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ChartCard],
  template: `
    <div class="cards">
      @for (c of cards(); track c.id) {
        <sm-chart-card
          [class.wide]="c.wide"
          [chartId]="c.id"
          [title]="c.title"
          [caption]="c.caption"
          [option]="c.option"
          [height]="c.height"
          [background]="theme().surface"
          [commentable]="commentable()"
          [comments]="countFor(c.id)"
          (comment)="comment.emit($event)"
        />
      }
    </div>
  `,
  styles: `
    .cards {
      display: grid;
      grid-template-columns: repeat(auto-fit, minmax(min(100%, 420px), 1fr));
      gap: 16px;
    }
    .wide {
      grid-column: 1 / -1;
    }
  `,
})
export class AnalysisCharts {
  private readonly scheme = inject(ColorScheme);
  readonly result = input.required<AnalysisResult>();
  readonly names = input<Record<string, string>>({});
  readonly responseLabel = input.required<string>();
  readonly rowCodes = input<string[]>([]);
  /** plan settings per run code; without it the box plots are left out */
  readonly rowSettings = input<Map<string, Record<string, string>> | null>(null);
  readonly commentable = input(false);
  readonly commentCounts = input<Record<string, number>>({});
  readonly comment = output<string>();

  protected readonly theme = computed(() => chartTheme(this.scheme.isDark()));

  protected countFor(chartId: string): number {
    return this.commentCounts()[`chart:${chartId}`] ?? 0;
  }

  private label(symbol: string): string {
    const name = this.names()[symbol];
    return name && name !== symbol ? `${name} (${symbol})` : symbol;
  }

  private effectRow(term: string): AnovaEffectRow | undefined {
    const [a, b] = term.split(':');
    return this.result().anova.find((r): r is AnovaEffectRow => r.source !== 'Residual' && (r.source === `${a}:${b}` || r.source === `${b}:${a}`));
  }

  private interactionCards(): CardSpec[] {
    const r = this.result();
    const theme = this.theme();
    const pairs = r.terms.filter((t) => t.split(':').length === 2);
    return pairs.flatMap((term) => {
      const [a, b] = term.split(':');
      const plot = r.plots.interactions.find((p) => (p.xFactor === a && p.seriesFactor === b) || (p.xFactor === b && p.seriesFactor === a));
      if (!plot) return [];
      const input: InteractionInput = { xFactor: plot.xFactor, seriesFactor: plot.seriesFactor, xLabel: this.label(plot.xFactor), seriesLabel: this.label(plot.seriesFactor), points: plot.points };
      const row = this.effectRow(term);
      const stat = row ? `${term}: F(${row.df}, ${r.model.residualDf}) = ${formatNumber(row.f)}, ${pPhrase(row.p)}.` : `${term}: not estimated.`;
      const caption = `${stat} Lines that are not parallel show an interaction; capsules are 95 % CIs of each cell mean.`;
      return [input, mirrored(input)].map((inp) => ({
        id: `interaction:${inp.xFactor}:${inp.seriesFactor}`,
        title: `Interaction ${inp.xFactor} × ${inp.seriesFactor}: lines per ${inp.seriesFactor}`,
        caption,
        option: interactionOption(inp, this.responseLabel(), theme),
        height: 320,
        wide: false,
      }));
    });
  }

  private boxCard(): CardSpec[] {
    const settings = this.rowSettings();
    const r = this.result();
    if (!settings) return [];
    const observed = r.fitted.map((f, i) => f + r.residuals[i]);
    const codes = this.rowCodes();
    const factors = r.factors.map((f) => {
      const levels = r.descriptives.byLevel[f]?.map((g) => g.levels[f]) ?? [];
      return {
        factor: f,
        label: this.label(f),
        levels: levels.map((level) => ({ level, values: observed.filter((_, i) => settings.get(codes[i] ?? '')?.[f] === level) })),
      };
    });
    return [{ id: 'box', title: 'Spread per level', caption: 'Boxes span the middle half of the runs, whiskers reach the furthest run within 1.5 box lengths; dots are the runs.', option: boxPlotOption(factors, this.responseLabel(), this.theme()), height: 300, wide: true }];
  }

  protected readonly cards = computed<CardSpec[]>(() => {
    const r = this.result();
    const theme = this.theme();
    const effects = r.plots.mainEffects.map((m) => ({ factor: m.factor, label: this.label(m.factor), points: m.points }));
    const cards: CardSpec[] = [
      {
        id: 'main-effects',
        title: 'Main effects',
        caption: 'Mean response per level with its 95 % CI; one panel per factor on a shared scale, the dashed line is the overall mean.',
        option: mainEffectsOption(effects, r.plots.grandMean, this.responseLabel(), theme),
        height: 300,
        wide: true,
      },
      ...this.interactionCards(),
      ...this.boxCard(),
      {
        id: 'residuals',
        title: 'Residuals vs fitted',
        caption: 'An even band around zero is what the model assumes; a funnel or a curve is worth a second look.',
        option: residualsOption(r.fitted, r.residuals, this.rowCodes(), r.model.residualSd, theme),
        height: 300,
        wide: false,
      },
    ];
    if (r.residuals.length >= 3) {
      cards.push({ id: 'qq', title: 'Normal Q-Q of residuals', caption: 'Points near the dashed line: residuals close to normal. Bends at the ends mean heavy tails or skew.', option: qqOption(r.residuals, theme), height: 300, wide: false });
    }
    return cards;
  });
}
