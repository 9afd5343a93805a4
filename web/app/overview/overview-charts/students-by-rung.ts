import type { Overview } from '@shared/api/analytics';
import { chartBase, categoryAxis, valueAxis } from '../../core/charts/chart-base';
import type { ChartFigure, DrillTarget } from '../../core/charts/chart-figure';
import { seriesColour, chartPalette } from '../../core/charts/chart-palette';
import { gradeLabel, rungLabel } from './figure-words';

interface Stack {
  label: string;
  fullName: string;
  counts: number[];
  drill: Overview['studentsByRung']['bySchool'][number]['drill'];
}

interface AxisParameter {
  seriesIndex: number;
  seriesName: string;
  value: number;
  marker: string;
  dataIndex: number;
}

/**
 * Students on each rung, stacked by school (the district) or by grade (one school). Segments tall
 * enough carry their count; every stack carries its total.
 */
export function studentsByRungFigure(overview: Overview, stackBy: 'school' | 'grade'): ChartFigure {
  const byRung = overview.studentsByRung;
  const stacks = stacksOf(byRung, stackBy);
  const rungs = byRung.rungs.map((entry) => entry.rung);
  const totals = byRung.rungs.map((entry) => entry.students);

  const segmentTarget = (stack: Stack, rung: number): DrillTarget => ({
    title: `${stack.fullName}, ${rungLabel(rung).toLowerCase()}`,
    path: stack.drill.path,
    query: { ...stack.drill.query, rung },
  });
  const rungTarget = (index: number): DrillTarget => ({
    title: `Every student on ${rungLabel(rungs[index]!).toLowerCase()}`,
    path: byRung.rungs[index]!.drill.path,
    query: byRung.rungs[index]!.drill.query,
  });

  const base = chartBase();
  return {
    option: {
      ...base,
      legend: { ...base.legend, data: stacks.map((stack) => stack.label) },
      tooltip: {
        ...base.tooltip,
        trigger: 'axis',
        axisPointer: { type: 'shadow' },
        formatter: (parameters: unknown) => {
          const list = (parameters as AxisParameter[]).filter(
            (entry) => entry.seriesIndex < stacks.length,
          );
          const index = list[0]?.dataIndex ?? 0;
          const lines = list
            .filter((entry) => entry.value > 0)
            .map(
              (entry) =>
                `${entry.marker}${stacks[entry.seriesIndex]!.fullName}: <b>${entry.value}</b>`,
            );
          return [`<b>${rungLabel(rungs[index]!)}</b> · ${totals[index]} students`, ...lines].join(
            '<br>',
          );
        },
      },
      xAxis: categoryAxis(rungs.map(rungLabel)),
      yAxis: valueAxis('Students'),
      series: stackSeries(stacks, totals),
    },
    table: {
      caption: `Students on each rung by ${stackBy}`,
      columns: ['Rung', ...stacks.map((stack) => stack.label), 'All'],
      rows: rungs.map((rung, index) => ({
        heading: rungLabel(rung),
        cells: [
          ...stacks.map((stack) => ({
            text: String(stack.counts[index] ?? 0),
            target: segmentTarget(stack, rung),
          })),
          { text: String(totals[index]), target: rungTarget(index) },
        ],
      })),
    },
    targetAt: (seriesIndex, dataIndex) => {
      const stack = stacks[seriesIndex];
      if (stack) return segmentTarget(stack, rungs[dataIndex]!);
      return dataIndex < rungs.length ? rungTarget(dataIndex) : null;
    },
  };
}

/** One stack per school (the district) or per grade (one school). */
function stacksOf(byRung: Overview['studentsByRung'], stackBy: 'school' | 'grade'): Stack[] {
  return stackBy === 'school'
    ? byRung.bySchool.map((school) => ({
        label: school.code,
        fullName: school.name,
        counts: school.counts,
        drill: school.drill,
      }))
    : byRung.byGrade.map((grade) => ({
        label: gradeLabel(grade.grade),
        fullName: gradeLabel(grade.grade),
        counts: grade.counts,
        drill: grade.drill,
      }));
}

/** A bar series per stack, its segments labelled when tall enough, and one carrying the totals. */
function stackSeries(stacks: Stack[], totals: number[]) {
  const tallest = Math.max(1, ...totals);
  return [
    ...stacks.map((stack, index) => ({
      type: 'bar' as const,
      name: stack.label,
      stack: 'students',
      data: stack.counts,
      itemStyle: { color: seriesColour(index), borderColor: '#fffbf7', borderWidth: 1 },
      emphasis: { focus: 'series' as const },
      label: {
        show: true,
        position: 'inside' as const,
        color: '#ffffff',
        fontSize: 11,
        formatter: ({ value }: { value: unknown }) =>
          Number(value) >= tallest * 0.07 ? String(value) : '',
      },
    })),
    {
      // An empty series on top of each stack that only carries the stack's total.
      type: 'bar' as const,
      name: 'Total',
      stack: 'students',
      data: totals.map(() => 0),
      silent: true,
      tooltip: { show: false },
      label: {
        show: true,
        position: 'top' as const,
        color: chartPalette.ink,
        fontWeight: 600,
        formatter: ({ dataIndex }: { dataIndex: number }) => String(totals[dataIndex]),
      },
    },
  ];
}
