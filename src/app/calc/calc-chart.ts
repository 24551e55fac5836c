import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { EChartsCoreOption } from 'echarts/core';
import { NgxEchartsDirective } from 'ngx-echarts';

/**
 * Thin wrapper around ngx-echarts: pages pass finished options (built by the pure functions in
 * chart-options.ts) and never touch the chart instance. The SVG renderer keeps lines crisp in
 * screenshots and print, and these charts have at most a few thousand points.
 */
@Component({
  selector: 'sm-calc-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [NgxEchartsDirective],
  template: `<div class="chart" echarts [options]="options()" [initOpts]="initOpts" [autoResize]="true" role="img" [attr.aria-label]="label()" [style.height.px]="height()" [style.aspect-ratio]="aspectRatio()"></div>`,
  styles: `
    :host {
      display: block;
    }
    .chart {
      width: 100%;
    }
  `,
})
export class CalcChart {
  readonly options = input.required<EChartsCoreOption>();
  /** Read by screen readers in place of the drawing: say what the chart shows. */
  readonly label = input.required<string>();
  /** Fixed height in px, or null to size by `aspectRatio` (width / height), e.g. for a square σ1–σ2 plot. */
  readonly height = input<number | null>(380);
  readonly aspectRatio = input<number | null>(null);
  protected readonly initOpts = { renderer: 'svg' as const };
}
