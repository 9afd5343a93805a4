import type { YearOverYear } from '@shared/api/year-over-year';
import {
  barByBarBase,
  chartBase,
  categoryAxis,
  percentAxis,
  sideCategoryAxis,
  valueAxis,
} from '../../core/charts/chart-base';
import type { ChartFigure, DrillTarget } from '../../core/charts/chart-figure';
import { chartPalette, seriesColour } from '../../core/charts/chart-palette';
import { gradeLabel, percentText } from './figure-words';

interface RetentionBar {
  label: string;
  name: string;
  players: number;
  continued: number;
  share: number | null;
  /** Whether the bar is a step into another school (drawn in brass). */
  changesSchool: boolean;
  query: DrillTarget['query'];
}

const retentionPath = '/api/analytics/retention/students';

/** Bars of the share of last year's players who play this year, with the names of who stopped. */
function retentionFigure(
  bars: RetentionBar[],
  figures: YearOverYear,
  caption: string,
  firstColumn: string,
): ChartFigure {
  const from = figures.previousYear?.name ?? '';
  const target = (bar: RetentionBar): DrillTarget => ({
    title: `${bar.name}: stopped after ${from}`,
    path: retentionPath,
    query: { ...bar.query, schoolYearId: figures.year.id, stopped: true },
  });
  return {
    option: {
      // Room on the right for each bar's label (share and counts).
      ...barByBarBase(104, (index) => {
        const bar = bars[index]!;
        return `<b>${bar.name}</b><br>${bar.continued} of ${bar.players} still play (${percentText(bar.share)})<br>${bar.players - bar.continued} stopped`;
      }),
      yAxis: sideCategoryAxis(bars.map((bar) => bar.label)),
      xAxis: percentAxis(),
      series: [
        {
          type: 'bar',
          name: 'Still play',
          barMaxWidth: 22,
          data: bars.map((bar) => ({
            value: bar.share === null ? 0 : Math.round(bar.share * 1000) / 10,
            itemStyle: {
              color: bar.changesSchool ? chartPalette.brass : chartPalette.teal,
              borderRadius: [0, 3, 3, 0],
            },
          })),
          label: {
            show: true,
            position: 'right',
            color: chartPalette.ink,
            fontWeight: 600,
            formatter: ({ dataIndex }: { dataIndex: number }) =>
              `${percentText(bars[dataIndex]!.share)} · ${bars[dataIndex]!.continued}/${bars[dataIndex]!.players}`,
          },
        },
      ],
    },
    table: {
      caption,
      columns: [firstColumn, `Played ${from}`, 'Still play', 'Stopped', 'Share'],
      rows: bars.map((bar) => ({
        heading: bar.name,
        cells: [
          { text: String(bar.players) },
          { text: String(bar.continued) },
          { text: String(bar.players - bar.continued), target: target(bar) },
          { text: percentText(bar.share) },
        ],
      })),
    },
    targetAt: (_series, dataIndex) => (bars[dataIndex] ? target(bars[dataIndex]) : null),
  };
}

/** Retention by the school the students played at last year. */
export function retentionBySchoolFigure(figures: YearOverYear): ChartFigure {
  return retentionFigure(
    figures.retention.bySchool.map((school) => ({
      label: school.code,
      name: school.name,
      players: school.players,
      continued: school.continued,
      share: school.share,
      changesSchool: false,
      query: { schoolId: school.schoolId },
    })),
    figures,
    'Retention by last year’s school',
    'School',
  );
}

/** Retention by grade transition; the steps into another school are drawn in brass. */
export function retentionByTransitionFigure(
  figures: YearOverYear,
  schoolId: number | undefined,
): ChartFigure {
  return retentionFigure(
    figures.retention.byTransition.map((step) => ({
      label: `${step.fromGrade === 0 ? 'K' : step.fromGrade} → ${step.toGrade}`,
      name: `${gradeLabel(step.fromGrade)} to ${gradeLabel(step.toGrade).toLowerCase()}${step.changesSchool ? ', into the next school' : ''}`,
      players: step.players,
      continued: step.continued,
      share: step.share,
      changesSchool: step.changesSchool,
      query: { grade: step.fromGrade, ...(schoolId === undefined ? {} : { schoolId }) },
    })),
    figures,
    'Retention by grade transition',
    'Transition',
  );
}

/**
 * Each cohort's median rung at each year's end (and now), one line per cohort. A climb needs two
 * years: the chart and its table show the cohorts with at least two years and five students.
 */
export function cohortClimbFigure(figures: YearOverYear): ChartFigure {
  const cohorts = figures.cohorts.filter(
    (cohort) => cohort.points.length >= 2 && (cohort.points[0]?.students ?? 0) >= 5,
  );
  const years = [
    ...new Set(cohorts.flatMap((cohort) => cohort.points.map((point) => point.year))),
  ].sort();
  const name = (cohort: YearOverYear['cohorts'][number]) =>
    `${gradeLabel(cohort.startGrade)} in ${cohort.startYear}`;
  const shortName = (cohort: YearOverYear['cohorts'][number]) =>
    cohort.startGrade === 0 ? 'K' : `Gr ${cohort.startGrade}`;
  const rung = (value: number) => (Number.isInteger(value) ? String(value) : value.toFixed(1));
  // Lines that end on the same median share one end label ("Gr 9, 10 · 5"), so none overlap.
  const lastMedian = (cohort: YearOverYear['cohorts'][number]) =>
    cohort.points[cohort.points.length - 1]!.median;
  const endLabel = (index: number) => {
    const value = lastMedian(cohorts[index]!);
    const same = cohorts.filter((cohort) => lastMedian(cohort) === value);
    if (same[0] !== cohorts[index]) return '';
    const grades = same.map((cohort) => (cohort.startGrade === 0 ? 'K' : cohort.startGrade));
    return `${same.length > 1 ? 'Gr ' + grades.join(', ') : shortName(same[0]!)} · ${rung(value)}`;
  };
  const base = chartBase();
  const now = (year: string) => (year === figures.year.name ? `${year} so far` : `end of ${year}`);
  return {
    option: {
      ...base,
      legend: { ...base.legend, type: 'scroll', data: cohorts.map(name) },
      tooltip: { ...base.tooltip, trigger: 'axis' },
      // Room on the right for each line's end label.
      grid: { ...base.grid, top: 64, bottom: 28, right: 120, left: 24 },
      xAxis: { ...categoryAxis(years.map(now), 'School year'), boundaryGap: false },
      yAxis: valueAxis('Median rung'),
      series: cohorts.map((cohort, index) => ({
        type: 'line' as const,
        name: name(cohort),
        data: years.map(
          (year) => cohort.points.find((point) => point.year === year)?.median ?? null,
        ),
        symbolSize: 8,
        lineStyle: { width: 2.5 },
        itemStyle: { color: seriesColour(index) },
        // The cohort's name and last median at the line's end, so no reading depends on colour.
        endLabel: {
          show: true,
          color: seriesColour(index),
          fontWeight: 600,
          formatter: () => endLabel(index),
        },
      })),
    },
    table: {
      caption: 'Median rung of each cohort at each year’s end',
      columns: ['Cohort (first year on record)', ...years.map(now)],
      rows: cohorts.map((cohort) => ({
        heading: name(cohort),
        cells: years.map((year) => {
          const point = cohort.points.find((entry) => entry.year === year);
          return { text: point ? `${rung(point.median)} (${point.students} students)` : '—' };
        }),
      })),
    },
    targetAt: () => null,
  };
}
