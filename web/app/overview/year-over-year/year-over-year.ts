import { ChangeDetectionStrategy, Component, computed, inject, input, output } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import type { SchoolYear } from '@shared/api/school-year';
import { ChartGrid, type ChartCardSpec } from '../../core/charts/chart-grid/chart-grid';
import type { DrillTarget } from '../../core/charts/chart-figure';
import { PageState } from '../../core/state/page-state';
import { OverviewData } from '../overview-data';
import { countText, percentText } from '../overview-charts/figure-words';
import {
  cohortClimbFigure,
  retentionBySchoolFigure,
  retentionByTransitionFigure,
} from '../overview-charts/year-over-year-figures';
import { rungByGradeYearsFigure } from '../overview-charts/rung-by-grade-years';

/**
 * Year over year on the Overview: how many of last year's players play this year, by school and
 * by grade transition (the names of those who stopped a click away), each grade's median rung
 * against last year's at the same point of the year, and each cohort's climb.
 */
@Component({
  selector: 'tb-year-over-year',
  imports: [ChartGrid, PageState],
  templateUrl: './year-over-year.html',
  styleUrl: './year-over-year.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class YearOverYearSection {
  private readonly data = inject(OverviewData);

  /** The past year to read, or null for the current year. */
  readonly pastYear = input<SchoolYear | null>(null);
  readonly schoolId = input<number | undefined>(undefined);
  readonly drill = output<DrillTarget>();

  protected readonly figures = rxResource({
    params: () => ({ schoolYearId: this.pastYear()?.id, schoolId: this.schoolId() }),
    stream: ({ params }) =>
      this.data.yearOverYear({
        ...(params.schoolYearId === undefined ? {} : { schoolYearId: params.schoolYearId }),
        ...(params.schoolId === undefined ? {} : { schoolId: params.schoolId }),
      }),
  });
  protected readonly charts = computed(() => {
    if (!this.figures.hasValue()) return null;
    const figures = this.figures.value();
    const bySchool = figures.retention.bySchool.length > 1;
    const cards: (ChartCardSpec | null)[] = [
      bySchool
        ? {
            testId: 'chart-retention-by-school',
            heading: "Still playing, by last year's school",
            description: 'Select a school to list the students who stopped.',
            figure: retentionBySchoolFigure(figures),
          }
        : null,
      {
        testId: 'chart-retention-by-transition',
        wide: !bySchool,
        heading: 'Still playing, by grade transition',
        description: "Last year's grade to this year's; select a bar to list who stopped.",
        figure: retentionByTransitionFigure(figures, this.schoolId()),
      },
      figures.rungByGrade.grades.length
        ? {
            testId: 'chart-rung-by-grade-years',
            wide: true,
            heading: 'Rung by grade, this year against last year',
            description: `Median rung of each grade's students ${figures.rungByGrade.day} days into the year, beside last year's students of that grade the same number of days into last year.`,
            figure: rungByGradeYearsFigure(figures, {
              current: this.pastYear() === null,
              schoolId: this.schoolId(),
            }),
          }
        : null,
      figures.cohorts.some((cohort) => cohort.points.length >= 2)
        ? {
            testId: 'chart-cohort-climb',
            wide: true,
            heading: 'Cohort climb',
            description:
              'Each line is the students first on record in one year and grade: their median rung at the end of each year since, and so far this year.',
            figure: cohortClimbFigure(figures),
            height: 320,
          }
        : null,
    ];
    return {
      figures,
      cards: cards.filter((card) => card !== null),
      lead: `Of ${countText(figures.retention.total.players, 'student')} who played in ${figures.previousYear?.name ?? ''} and are still in the district, ${figures.retention.total.continued.toLocaleString('en-US')} play in ${figures.year.name} (${percentText(figures.retention.total.share)}). Brass bars are the steps into the next school.`,
    };
  });
  protected readonly percentText = percentText;
}
