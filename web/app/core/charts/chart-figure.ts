import type { ComposeOption } from 'echarts/core';
import type { BarSeriesOption, LineSeriesOption } from 'echarts/charts';
import type {
  AriaComponentOption,
  GridComponentOption,
  LegendComponentOption,
  MarkLineComponentOption,
  TooltipComponentOption,
} from 'echarts/components';

/** The options of the chart types and components the app registers. */
export type ChartOption = ComposeOption<
  | BarSeriesOption
  | LineSeriesOption
  | GridComponentOption
  | TooltipComponentOption
  | LegendComponentOption
  | MarkLineComponentOption
  | AriaComponentOption
>;

/** The rows behind one figure: the list route that answers them, its filters, and a title. */
export interface DrillTarget {
  title: string;
  path: string;
  query: Record<string, string | number | boolean>;
}

/** One cell of a chart's table; a cell with a target opens the rows behind it. */
export interface ChartCell {
  text: string;
  target?: DrillTarget;
}

/** The table a chart can be read as instead, with the same figures. */
export interface ChartTable {
  caption: string;
  /** Column headings; the first heads the row headings. */
  columns: string[];
  rows: { heading: string; cells: ChartCell[] }[];
}

/** A chart, the same figures as a table, and the rows behind each bar or point. */
export interface ChartFigure {
  option: ChartOption;
  table: ChartTable;
  /** The rows behind the element at a series and data index, or null when there are none. */
  targetAt(seriesIndex: number, dataIndex: number): DrillTarget | null;
}
