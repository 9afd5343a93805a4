import { chartPalette, chartText } from './chart-palette';
import type { ChartOption } from './chart-figure';

/** The settings every chart starts from: our type and greys, a described chart for screen readers. */
export function chartBase(): ChartOption {
  return {
    color: [...chartPalette.series],
    textStyle: { ...chartText },
    animationDuration: 300,
    // ECharts' aria component writes a plain-language description onto the chart's element.
    aria: { enabled: true, label: { enabled: true } },
    grid: { left: 8, right: 16, top: 56, bottom: 8, containLabel: true },
    tooltip: {
      confine: true,
      backgroundColor: '#fffbf7',
      borderColor: chartPalette.line,
      textStyle: { ...chartText, fontSize: 13 },
    },
    legend: {
      top: 0,
      left: 0,
      icon: 'roundRect',
      itemWidth: 14,
      itemHeight: 10,
      textStyle: { ...chartText },
    },
  };
}

/** A category axis with readable labels. */
export function categoryAxis(labels: string[], name?: string) {
  return {
    type: 'category' as const,
    data: labels,
    name,
    nameLocation: 'middle' as const,
    nameGap: 36,
    nameTextStyle: { ...chartText, color: chartPalette.muted },
    axisTick: { show: false },
    axisLine: { lineStyle: { color: chartPalette.line } },
    axisLabel: { ...chartText, interval: 0, hideOverlap: true },
  };
}

/** A value axis with faint grid lines. */
export function valueAxis(name?: string, format?: string) {
  return {
    type: 'value' as const,
    name,
    nameTextStyle: { ...chartText, color: chartPalette.muted, align: 'left' as const },
    minInterval: 1,
    splitLine: { lineStyle: { color: chartPalette.faint } },
    axisLabel: { ...chartText, color: chartPalette.muted, formatter: format },
  };
}

/**
 * The tooltip of a bar chart read by category: shaded across the category under the pointer,
 * its text the `describe`d category (ECharts hands an axis tooltip one entry per series).
 */
export function shadedAxisTooltip(base: ChartOption, describe: (index: number) => string) {
  return {
    ...base.tooltip,
    trigger: 'axis' as const,
    axisPointer: { type: 'shadow' as const },
    formatter: (parameters: unknown) =>
      describe((parameters as { dataIndex: number }[])[0]?.dataIndex ?? 0),
  };
}

/**
 * The settings of a chart whose bars are read one at a time: no legend, room above the bars for a
 * line's label and `right` pixels beside them for the bars' own, and a tooltip that is the
 * `describe`d bar under the pointer.
 */
export function barByBarBase(right: number, describe: (index: number) => string): ChartOption {
  const base = chartBase();
  return {
    ...base,
    legend: { show: false },
    grid: { ...base.grid, top: 28, right },
    tooltip: {
      ...base.tooltip,
      trigger: 'item',
      formatter: (parameter: unknown) => describe((parameter as { dataIndex: number }).dataIndex),
    },
  };
}

/** A value axis of percentages, 0 to 100 in quarters. */
export function percentAxis() {
  return { ...valueAxis(undefined, '{value}%'), max: 100, interval: 25 };
}

/**
 * A category axis down the side, first category on top, every label shown (bars run across, so
 * long labels stay readable); `label` adds to the labels' text style.
 */
export function sideCategoryAxis(labels: string[], label: object = {}) {
  return {
    ...categoryAxis(labels),
    inverse: true,
    axisLabel: { ...chartText, interval: 0, ...label },
  };
}
