import type { BarSeriesOption } from 'echarts/charts';
import type { Overview } from '@shared/api/analytics';
import { barByBarBase, percentAxis, sideCategoryAxis } from '../../core/charts/chart-base';
import type { ChartFigure, DrillTarget } from '../../core/charts/chart-figure';
import { chartPalette } from '../../core/charts/chart-palette';
import { gradeLabel, percentText, shortDate } from './figure-words';

interface ShareBar {
  axisLabel: string;
  name: string;
  atOrAbove: number;
  students: number;
  share: number | null;
  benchmark?: string;
  drill: { path: string; query: DrillTarget['query'] };
}

/** The share of all the bars' students at or above their benchmark, or null with no students. */
export function overallShare(bars: { atOrAbove: number; students: number }[]): number | null {
  const students = bars.reduce((sum, bar) => sum + bar.students, 0);
  return students === 0 ? null : bars.reduce((sum, bar) => sum + bar.atOrAbove, 0) / students;
}

function shareFigure(
  bars: ShareBar[],
  caption: string,
  firstColumn: string,
  overallLabel: string,
): ChartFigure {
  const overall = overallShare(bars);
  const target = (bar: ShareBar): DrillTarget => ({
    title: `${bar.name}: below the benchmark`,
    path: bar.drill.path,
    query: bar.drill.query,
  });
  return {
    option: {
      ...barByBarBase(24, (index) => {
        const bar = bars[index]!;
        const benchmark = bar.benchmark ? `<br>Benchmark: ${bar.benchmark}` : '';
        return `<b>${bar.name}</b>${benchmark}<br>${bar.atOrAbove} of ${bar.students} at or above (${percentText(bar.share)})`;
      }),
      xAxis: percentAxis(),
      // Bars run across so long labels (a grade's benchmark, a school's name) stay readable.
      yAxis: sideCategoryAxis(
        bars.map((bar) => bar.axisLabel),
        { lineHeight: 15, rich: { benchmark: { fontSize: 11, color: chartPalette.muted } } },
      ),
      series: [shareSeries(bars, overall, overallLabel)],
    },
    table: {
      caption,
      columns: [
        firstColumn,
        ...(bars.some((bar) => bar.benchmark) ? ['Benchmark'] : []),
        'At or above',
        'Below',
        'Students',
        'Share',
      ],
      rows: bars.map((bar) => ({
        heading: bar.name,
        cells: [
          ...(bar.benchmark ? [{ text: bar.benchmark }] : []),
          { text: String(bar.atOrAbove) },
          { text: String(bar.students - bar.atOrAbove), target: target(bar) },
          { text: String(bar.students) },
          { text: percentText(bar.share) },
        ],
      })),
    },
    targetAt: (_seriesIndex, dataIndex) => (bars[dataIndex] ? target(bars[dataIndex]) : null),
  };
}

/** The bars' shares in percent, labelled at their ends, and a dashed line at the overall share. */
function shareSeries(
  bars: ShareBar[],
  overall: number | null,
  overallLabel: string,
): BarSeriesOption {
  return {
    type: 'bar',
    name: 'At or above benchmark',
    barMaxWidth: 22,
    data: bars.map((bar) => (bar.share === null ? null : Math.round(bar.share * 1000) / 10)),
    itemStyle: { color: chartPalette.teal, borderRadius: [0, 4, 4, 0] },
    // Inside the bar's end, so the value never meets the dashed line.
    label: {
      show: true,
      position: 'insideRight',
      fontWeight: 600,
      color: '#ffffff',
      formatter: ({ dataIndex }: { dataIndex: number }) => percentText(bars[dataIndex]!.share),
    },
    markLine:
      overall === null
        ? undefined
        : {
            silent: true,
            symbol: 'none',
            lineStyle: { color: chartPalette.brass, type: 'dashed', width: 2 },
            label: {
              position: 'start',
              distance: 6,
              color: '#5a3a00',
              backgroundColor: '#fffbf7',
              padding: [2, 4],
              fontWeight: 600,
              formatter: `${overallLabel} ${percentText(overall)}`,
            },
            data: [{ xAxis: Math.round((overall ?? 0) * 1000) / 10 }],
          },
  };
}

/** The share at or above the benchmark in each grade, the benchmark under each bar. */
export function benchmarkByGradeFigure(overview: Overview): ChartFigure {
  const bars = overview.benchmark.byGrade.map((entry) => ({
    axisLabel: `${gradeLabel(entry.grade)}\n{benchmark|rung ${entry.rung} by ${shortDate(entry.byDate)}}`,
    name: gradeLabel(entry.grade),
    benchmark: `rung ${entry.rung} by ${shortDate(entry.byDate)}`,
    ...entry,
  }));
  return shareFigure(bars, 'Share at or above the benchmark by grade', 'Grade', 'All grades');
}

/** The share at or above the benchmark in each school. */
export function benchmarkBySchoolFigure(overview: Overview): ChartFigure {
  const bars = overview.benchmark.bySchool.map((entry) => ({ axisLabel: entry.name, ...entry }));
  return shareFigure(bars, 'Share at or above the benchmark by school', 'School', 'District');
}
