// Tree-shaken echarts: only the chart types and components Specimetry draws. Loaded lazily through
// provideEchartsCore so pages without charts never download it (full echarts is ~1 MB).
import { BarChart, BoxplotChart, CustomChart, LineChart, ScatterChart } from 'echarts/charts';
import {
  DataZoomComponent,
  GridComponent,
  LegendComponent,
  MarkAreaComponent,
  MarkLineComponent,
  TitleComponent,
  ToolboxComponent,
  TooltipComponent,
} from 'echarts/components';
import * as echarts from 'echarts/core';
import { CanvasRenderer, SVGRenderer } from 'echarts/renderers';

echarts.use([
  LineChart,
  BarChart,
  ScatterChart,
  BoxplotChart,
  CustomChart,
  GridComponent,
  TooltipComponent,
  LegendComponent,
  TitleComponent,
  MarkAreaComponent,
  MarkLineComponent,
  DataZoomComponent,
  ToolboxComponent,
  SVGRenderer,
  CanvasRenderer,
]);

export { echarts };
