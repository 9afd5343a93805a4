import type { YearOverYear } from '@shared/api/year-over-year';
import {
  chartBase,
  categoryAxis,
  shadedAxisTooltip,
  valueAxis,
} from '../../core/charts/chart-base';
import type { ChartFigure, DrillTarget } from '../../core/charts/chart-figure';
import { chartPalette } from '../../core/charts/chart-palette';
import { countText, gradeLabel, shortDate } from './figure-words';

const rungText = (median: number | null) =>
  median === null ? '—' : Number.isInteger(median) ? String(median) : median.toFixed(1);

/**
 * Each grade's median rung on the day read this year beside last year's students of that grade
 * the same number of days into last year, both labelled, with the students counted in the
 * tooltip and the table. When the compared year is the current one, this year's bar and count
 * open the grade's students (last year's grade is history: no list behind it).
 */
export function rungByGradeYearsFigure(
  figures: YearOverYear,
  options: { current: boolean; schoolId: number | undefined },
): ChartFigure {
  const { grades, asOf, previousAsOf } = figures.rungByGrade;
  const target = (index: number): DrillTarget | null => {
    const grade = grades[index];
    if (!options.current || !grade) return null;
    return {
      title: `${gradeLabel(grade.grade)}: every student`,
      path: '/api/analytics/students',
      query: {
        grade: grade.grade,
        ...(options.schoolId === undefined ? {} : { schoolId: options.schoolId }),
      },
    };
  };
  const thisName = `${figures.year.name}, ${shortDate(asOf)}`;
  const lastName = `${figures.previousYear?.name ?? ''}, ${previousAsOf ? shortDate(previousAsOf) : ''}`;
  const base = chartBase();
  return {
    option: {
      ...base,
      legend: { ...base.legend, data: [lastName, thisName] },
      tooltip: shadedAxisTooltip(base, (index) => {
        const grade = grades[index]!;
        return `<b>${gradeLabel(grade.grade)}</b><br>${lastName}: median rung ${rungText(grade.previous.median)} (${countText(grade.previous.students, 'student')})<br>${thisName}: median rung ${rungText(grade.current.median)} (${countText(grade.current.students, 'student')})`;
      }),
      xAxis: categoryAxis(
        grades.map((entry) => (entry.grade === 0 ? 'K' : String(entry.grade))),
        'Grade',
      ),
      yAxis: valueAxis('Median rung'),
      grid: { ...base.grid, bottom: 28 },
      series: [
        medianBars(
          lastName,
          grades.map((entry) => entry.previous.median),
          {
            bar: chartPalette.muted,
            label: chartPalette.muted,
          },
        ),
        medianBars(
          thisName,
          grades.map((entry) => entry.current.median),
          {
            bar: chartPalette.teal,
            label: chartPalette.ink,
          },
        ),
      ],
    },
    table: rungByGradeTable(figures, lastName, thisName, target),
    targetAt: (seriesIndex, dataIndex) => (seriesIndex === 1 ? target(dataIndex) : null),
  };
}

/** One year's bars, each labelled with its median rung. */
function medianBars(
  name: string,
  medians: (number | null)[],
  colors: { bar: string; label: string },
) {
  return {
    type: 'bar' as const,
    name,
    barMaxWidth: 28,
    data: medians,
    itemStyle: { color: colors.bar, borderRadius: [3, 3, 0, 0] },
    label: {
      show: true,
      position: 'top' as const,
      color: colors.label,
      fontWeight: 600,
      formatter: ({ value }: { value: unknown }) => (value === null ? '' : rungText(Number(value))),
    },
  };
}

/** The figure's table: each grade's median rung and students counted, last year then this. */
function rungByGradeTable(
  figures: YearOverYear,
  lastName: string,
  thisName: string,
  target: (index: number) => DrillTarget | null,
): ChartFigure['table'] {
  const { grades } = figures.rungByGrade;
  return {
    caption: `Median rung by grade, ${figures.rungByGrade.day} days into each year`,
    columns: [
      'Grade',
      `${lastName}: median rung`,
      'Students',
      `${thisName}: median rung`,
      'Students',
    ],
    rows: grades.map((entry, index) => ({
      heading: gradeLabel(entry.grade),
      cells: [
        { text: rungText(entry.previous.median) },
        { text: String(entry.previous.students) },
        { text: rungText(entry.current.median) },
        { text: String(entry.current.students), target: target(index) ?? undefined },
      ],
    })),
  };
}
