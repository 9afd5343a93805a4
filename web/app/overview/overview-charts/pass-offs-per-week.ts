import type { Overview } from '@shared/api/analytics';
import {
  chartBase,
  categoryAxis,
  shadedAxisTooltip,
  valueAxis,
} from '../../core/charts/chart-base';
import type { ChartFigure, DrillTarget } from '../../core/charts/chart-figure';
import { chartPalette } from '../../core/charts/chart-palette';
import { shortDate } from './figure-words';

/**
 * Pass-offs heard each week of the school year, with the passed ones drawn inside them. Past two
 * months of weeks the bars carry no value labels, which would collide (the tooltip and table have them).
 */
export function passOffsPerWeekFigure(overview: Overview): ChartFigure {
  const weeks = overview.passOffsPerWeek;
  const labelled = weeks.length <= 8;
  const target = (index: number, passedOnly: boolean): DrillTarget => {
    const week = weeks[index]!;
    return {
      title: `${passedOnly ? 'Passed' : 'Heard'} in the week of ${shortDate(week.weekStart)}`,
      path: week.drill.path,
      query: passedOnly ? { ...week.drill.query, passed: true } : week.drill.query,
    };
  };
  const base = chartBase();
  return {
    option: {
      ...base,
      legend: { ...base.legend, data: ['Heard', 'Passed'] },
      tooltip: shadedAxisTooltip(base, (index) => {
        const week = weeks[index]!;
        return `<b>Week of ${shortDate(week.weekStart)}</b><br>Heard: <b>${week.heard}</b><br>Passed: <b>${week.passed}</b>`;
      }),
      xAxis: {
        ...categoryAxis(weeks.map((week) => shortDate(week.weekStart))),
        axisLabel: { interval: 'auto', hideOverlap: true },
      },
      yAxis: valueAxis('Pass-offs'),
      series: [
        {
          type: 'bar',
          name: 'Heard',
          data: weeks.map((week) => week.heard),
          barMaxWidth: 28,
          itemStyle: { color: chartPalette.line, borderColor: chartPalette.muted, borderWidth: 1 },
          label: { show: labelled, position: 'top', color: chartPalette.muted, fontSize: 11 },
        },
        {
          type: 'bar',
          name: 'Passed',
          data: weeks.map((week) => week.passed),
          barGap: '-100%',
          barMaxWidth: 28,
          itemStyle: { color: chartPalette.teal },
          label: { show: labelled, position: 'insideTop', color: '#ffffff', fontSize: 11 },
        },
      ],
    },
    table: {
      caption: 'Pass-offs heard and passed each week',
      columns: ['Week of', 'Heard', 'Passed'],
      rows: weeks.map((week, index) => ({
        heading: shortDate(week.weekStart),
        cells: [
          { text: String(week.heard), target: target(index, false) },
          { text: String(week.passed), target: target(index, true) },
        ],
      })),
    },
    targetAt: (seriesIndex, dataIndex) =>
      weeks[dataIndex] ? target(dataIndex, seriesIndex === 1) : null,
  };
}
