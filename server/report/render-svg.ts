import * as echarts from 'echarts';
import type { EChartsOption } from 'echarts';

/**
 * Server-side rendering with echarts' own SVG renderer (no browser, no canvas): the same option the
 * client draws becomes a standalone SVG string for the printable page and the PDF.
 */
export function renderSvg(option: EChartsOption, width = 640, height = 360): string {
  const chart = echarts.init(null, null, { renderer: 'svg', ssr: true, width, height });
  try {
    chart.setOption({ ...option, animation: false });
    return chart.renderToSVGString();
  } finally {
    // dispose() releases the chart's timers; without it the process keeps running.
    chart.dispose();
  }
}
