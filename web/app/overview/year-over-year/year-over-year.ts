import { ChangeDetectionStrategy, Component, computed, inject, input, output } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import type { SchoolYear } from '@shared/api/school-year';
import { ChartCard } from '../../core/charts/chart-card/chart-card';
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
  imports: [ChartCard, PageState],
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
    return {
      figures,
      total: figures.retention.total,
      bySchool: figures.retention.bySchool.length > 1 ? retentionBySchoolFigure(figures) : null,
      byTransition: retentionByTransitionFigure(figures, this.schoolId()),
      rungByGrade: figures.rungByGrade.grades.length
        ? rungByGradeYearsFigure(figures, {
            current: this.pastYear() === null,
            schoolId: this.schoolId(),
          })
        : null,
      rungByGradeDay: figures.rungByGrade.day,
      cohorts: figures.cohorts.some((cohort) => cohort.points.length >= 2)
        ? cohortClimbFigure(figures)
        : null,
      lead: `Of ${countText(figures.retention.total.players, 'student')} who played in ${figures.previousYear?.name ?? ''} and are still in the district, ${figures.retention.total.continued.toLocaleString('en-US')} play in ${figures.year.name} (${percentText(figures.retention.total.share)}). Brass bars are the steps into the next school.`,
    };
  });
  protected readonly percentText = percentText;
}
