import type { Overview } from '@shared/api/analytics';
import { chartBase, categoryAxis, valueAxis } from '../../core/charts/chart-base';
import type { ChartFigure, DrillTarget } from '../../core/charts/chart-figure';
import { chartPalette } from '../../core/charts/chart-palette';
import { gradeLabel } from './figure-words';

/** The median rung of each grade beside the grade's benchmark rung, both labelled. */
export function medianRungFigure(overview: Overview): ChartFigure {
  const grades = overview.medianRungByGrade;
  const benchmarkOf = (grade: number) =>
    overview.benchmark.byGrade.find((entry) => entry.grade === grade)?.rung ?? null;
  const target = (index: number): DrillTarget => {
    const entry = grades[index]!;
    return {
      title: `${gradeLabel(entry.grade)}: every student`,
      path: entry.drill.path,
      query: entry.drill.query,
    };
  };
  const median = (value: number) => (Number.isInteger(value) ? String(value) : value.toFixed(1));
  const base = chartBase();
  return {
    option: {
      ...base,
      legend: { ...base.legend, data: ['Median rung', 'Benchmark rung'] },
      tooltip: { ...base.tooltip, trigger: 'axis', axisPointer: { type: 'shadow' } },
      xAxis: categoryAxis(
        grades.map((entry) => (entry.grade === 0 ? 'K' : String(entry.grade))),
        'Grade',
      ),
      yAxis: { ...valueAxis('Rung'), max: overview.rungCount || undefined },
      grid: { ...base.grid, bottom: 28 },
      series: [
        {
          type: 'bar',
          name: 'Median rung',
          barMaxWidth: 28,
          data: grades.map((entry) => entry.median),
          itemStyle: { color: chartPalette.teal, borderRadius: [3, 3, 0, 0] },
          label: {
            show: true,
            position: 'top',
            color: chartPalette.ink,
            fontWeight: 600,
            formatter: ({ value }: { value: unknown }) => median(Number(value)),
          },
        },
        {
          type: 'bar',
          name: 'Benchmark rung',
          barMaxWidth: 28,
          data: grades.map((entry) => benchmarkOf(entry.grade)),
          itemStyle: { color: chartPalette.brass, borderRadius: [3, 3, 0, 0] },
          label: { show: true, position: 'top', color: '#5a3a00', fontSize: 11 },
        },
      ],
    },
    table: {
      caption: 'Median rung by grade, with the benchmark rung',
      columns: ['Grade', 'Median rung', 'Benchmark rung', 'Students'],
      rows: grades.map((entry, index) => ({
        heading: gradeLabel(entry.grade),
        cells: [
          { text: median(entry.median) },
          { text: benchmarkOf(entry.grade)?.toString() ?? '—' },
          { text: String(entry.students), target: target(index) },
        ],
      })),
    },
    targetAt: (_seriesIndex, dataIndex) => (grades[dataIndex] ? target(dataIndex) : null),
  };
}
