import { ChangeDetectionStrategy, Component, ElementRef, computed, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { MatTooltipModule } from '@angular/material/tooltip';
import type { ECharts } from 'echarts/core';
import { NgxEchartsDirective } from 'ngx-echarts';
import type { ChartOption } from './chart-kit';

/** What the rendered chart holds, read back from the echarts instance (tests and screen readers use it). */
interface RenderedShape {
  lines: number;
  pointsPerLine: number[];
}

function shapeOf(chart: ECharts): RenderedShape {
  const option = chart.getOption() as { series?: { type?: string; id?: string; data?: unknown[] }[] };
  const lines = (option.series ?? []).filter((s) => s.type === 'line' && String(s.id ?? '').startsWith('line:'));
  return { lines: lines.length, pointsPerLine: lines.map((s) => s.data?.length ?? 0) };
}

function download(name: string, blob: Blob): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  a.click();
  // Revoked on the next turn: the click has handed the URL to the download manager by then.
  setTimeout(() => URL.revokeObjectURL(url));
}

/**
 * A chart in a card: title, plain-language caption, the chart (ngx-echarts), PNG/SVG download and a
 * comment affordance. The only component that touches an echarts instance; pages pass an option.
 */
@Component({
  selector: 'sm-chart-card',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [NgxEchartsDirective, MatButtonModule, MatIconModule, MatMenuModule, MatTooltipModule],
  host: {
    class: 'chart-card',
    '[attr.data-chart]': 'chartId()',
    '[attr.data-line-series]': 'shape()?.lines ?? null',
    '[attr.data-line-points]': 'shape()?.pointsPerLine?.join(",") ?? null',
  },
  template: `
    <header>
      <h3>{{ title() }}</h3>
      <span class="spacer"></span>
      @if (commentable()) {
        <button mat-icon-button (click)="comment.emit(anchor())" [attr.aria-label]="'Comment on ' + title()" matTooltip="Comment on this chart">
          <mat-icon>add_comment</mat-icon>
        </button>
      }
      @if (comments() > 0) {
        <span class="count" [attr.aria-label]="comments() + ' comments'"><mat-icon inline>forum</mat-icon>{{ comments() }}</span>
      }
      <button mat-icon-button [matMenuTriggerFor]="dl" [attr.aria-label]="'Download ' + title()" matTooltip="Download">
        <mat-icon>download</mat-icon>
      </button>
      <mat-menu #dl="matMenu">
        <button mat-menu-item (click)="downloadPng()"><mat-icon>image</mat-icon>PNG image</button>
        <button mat-menu-item (click)="downloadSvg()"><mat-icon>polyline</mat-icon>SVG drawing</button>
      </mat-menu>
    </header>
    <div echarts class="plot" [options]="option()" [style.height.px]="height()" (chartInit)="keep($event)" (chartFinished)="readShape()"></div>
    @if (caption()) {
      <p class="caption">{{ caption() }}</p>
    }
  `,
  styles: `
    :host {
      display: block;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--mat-sys-corner-large);
      background: var(--mat-sys-surface-container-lowest);
      padding: 12px 16px 14px;
    }
    header {
      display: flex;
      align-items: center;
      gap: 4px;
      margin-bottom: 4px;
    }
    h3 {
      font: var(--mat-sys-title-small);
      border-left: 3px solid var(--sm-accent);
      padding-left: 8px;
    }
    .spacer {
      flex: 1;
    }
    .count {
      display: inline-flex;
      align-items: center;
      gap: 2px;
      font: var(--mat-sys-label-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    .caption {
      margin: 6px 0 0;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class ChartCard {
  private readonly host = inject(ElementRef<HTMLElement>);
  readonly chartId = input.required<string>();
  readonly title = input.required<string>();
  readonly option = input.required<ChartOption>();
  readonly caption = input('');
  readonly height = input(300);
  /** background painted into downloads (the page surface of the current colour scheme) */
  readonly background = input('#ffffff');
  readonly commentable = input(false);
  readonly comments = input(0);
  readonly comment = output<string>();

  protected readonly anchor = computed(() => `chart:${this.chartId()}`);
  protected readonly shape = signal<RenderedShape | null>(null);
  private chart: ECharts | null = null;

  protected keep(chart: ECharts): void {
    this.chart = chart;
  }

  protected readShape(): void {
    if (this.chart) this.shape.set(shapeOf(this.chart));
  }

  private fileName(ext: string): string {
    return `${this.chartId().replace(/[^A-Za-z0-9_-]+/g, '-')}.${ext}`;
  }

  protected downloadPng(): void {
    if (!this.chart) return;
    const url = this.chart.getDataURL({ type: 'png', pixelRatio: 2, backgroundColor: this.background() });
    void fetch(url)
      .then((r) => r.blob())
      .then((blob) => download(this.fileName('png'), blob));
  }

  /** Re-renders the same option with echarts' SVG renderer off-screen: a true vector file, not a traced image. */
  protected async downloadSvg(): Promise<void> {
    const { echarts } = await import('../core/echarts-setup');
    const plot = this.host.nativeElement.querySelector('.plot') as HTMLElement | null;
    const width = plot?.clientWidth || 720;
    const height = plot?.clientHeight || this.height();
    const holder = document.createElement('div');
    holder.style.cssText = `position:fixed;left:-10000px;top:0;width:${width}px;height:${height}px;`;
    document.body.appendChild(holder);
    const svgChart = echarts.init(holder, null, { renderer: 'svg', width, height });
    try {
      svgChart.setOption({ ...this.option(), animation: false, backgroundColor: this.background() });
      download(this.fileName('svg'), new Blob([svgChart.renderToSVGString()], { type: 'image/svg+xml' }));
    } finally {
      svgChart.dispose();
      holder.remove();
    }
  }
}
