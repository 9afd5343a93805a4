import type { Provider } from '@angular/core';
import { provideEchartsCore } from 'ngx-echarts';
import * as echarts from 'echarts/core';
import { BarChart, LineChart } from 'echarts/charts';
import {
  AriaComponent,
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  TooltipComponent,
} from 'echarts/components';
import { SVGRenderer } from 'echarts/renderers';

// Only what our charts draw, so the lazy route's chunk stays small (ECharts' tree-shaking guide).
echarts.use([
  BarChart,
  LineChart,
  AriaComponent,
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  TooltipComponent,
  SVGRenderer,
]);

/** Provides ECharts to a lazy route's components. Import it from lazy routes only. */
export function provideCharts(): Provider {
  return provideEchartsCore({ echarts });
}
