import '../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
} from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { Router } from '@angular/router';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { MatIconModule } from '@angular/material/icon';
import { MatButtonModule } from '@angular/material/button';
import { of } from 'rxjs';
import type { Overview as OverviewFigures } from '@shared/api/analytics';
import { CurrentUser } from '../core/auth/current-user';
import { ChartGrid, type ChartCardSpec } from '../core/charts/chart-grid/chart-grid';
import type { DrillTarget } from '../core/charts/chart-figure';
import { PageState } from '../core/state/page-state';
import { SchoolData } from '../schools/school-data';
import { AuditionReady } from './audition-ready/audition-ready';
import { DrillPanel } from './drill-panel/drill-panel';
import { FigureTiles, fleetTiles, ladderTiles } from './figure-tiles/figure-tiles';
import { OverviewData, type OverviewFilters } from './overview-data';
import { benchmarkByGradeFigure, benchmarkBySchoolFigure } from './overview-charts/benchmark-share';
import { gradeLabel } from './overview-charts/figure-words';
import { medianRungFigure } from './overview-charts/median-rung';
import { passOffsPerWeekFigure } from './overview-charts/pass-offs-per-week';
import { studentsByRungFigure } from './overview-charts/students-by-rung';
import { QuietDirectors } from './quiet-directors/quiet-directors';
import { OverviewSchoolList } from './school-list/school-list';
import { FirstDayGuide } from './first-day-guide/first-day-guide';
import { YearOverYearSection } from './year-over-year/year-over-year';
import type { SchoolYear } from '@shared/api/school-year';
import { YearPicker } from '../school-years/year-picker/year-picker';

const wholeNumber = (text: string | undefined) =>
  text && /^\d+$/.test(text) ? Number(text) : undefined;
const gradesIn = (figures: OverviewFigures) =>
  figures.studentsByRung.byGrade.map((entry) => entry.grade);

/**
 * The district (or a director's schools) at a glance: headline figures, the ladder charts with a
 * table alternative each, the fleet, and the schools. Every figure opens the rows behind it.
 */
@Component({
  selector: 'tb-overview',
  imports: [
    PageState,
    MatIconModule,
    MatButtonModule,
    MatFormFieldModule,
    MatSelectModule,
    ChartGrid,
    FigureTiles,
    AuditionReady,
    QuietDirectors,
    OverviewSchoolList,
    FirstDayGuide,
    YearOverYearSection,
    YearPicker,
  ],
  templateUrl: './overview.html',
  styleUrl: './overview.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Overview {
  private readonly data = inject(OverviewData);
  private readonly schoolData = inject(SchoolData);
  private readonly currentUser = inject(CurrentUser);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);

  /** Query parameters `?schoolId=&grade=`, bound by the router. */
  readonly schoolId = input<string>();
  readonly grade = input<string>();

  protected readonly me = this.currentUser.me;
  /** A past year chosen in the year picker (history, read-only), or null for the current year. */
  protected readonly pastYear = signal<SchoolYear | null>(null);
  /** Whether the first-day guide applies: the coordinator sets the district up. */
  protected readonly guidesSetup = computed(
    () => this.currentUser.can('schools:write') && this.currentUser.can('people:manage'),
  );
  /** Whether the role reads the ladder figures (a technician sees the fleet only). */
  protected readonly readsLadder = computed(() => this.currentUser.can('pass-offs:read'));
  protected readonly filters = computed<OverviewFilters>(() => {
    const filters: OverviewFilters = {};
    const school = wholeNumber(this.schoolId());
    const grade = wholeNumber(this.grade());
    if (school !== undefined) filters.schoolId = school;
    if (grade !== undefined) filters.grade = grade;
    return filters;
  });

  protected readonly schools = rxResource({
    stream: () => this.schoolData.list({ limit: 200, sort: 'name:asc' }),
  });
  protected readonly figures = rxResource({
    params: () => ({
      filters: this.filters(),
      reads: this.readsLadder() && this.pastYear() === null,
    }),
    stream: ({ params }) => (params.reads ? this.data.overview(params.filters) : of(null)),
  });
  protected readonly fleet = rxResource({
    params: () => this.filters(),
    stream: ({ params }) => this.data.fleet(params),
  });

  /** Whether the school filter is worth offering: more than one school in reach. */
  protected readonly offersSchools = computed(() => (this.schools.value()?.rows.length ?? 0) > 1);
  /** The grades seen without a grade filter, kept while one grade is chosen. */
  protected readonly grades = linkedSignal<OverviewFigures | null | undefined, number[]>({
    source: () => this.figures.value(),
    computation: (figures, previous) => {
      if (!figures) return previous?.value ?? [];
      return figures.filters.grade === null
        ? gradesIn(figures)
        : (previous?.value ?? gradesIn(figures));
    },
  });
  protected readonly gradeLabel = gradeLabel;

  protected readonly tiles = computed(() => {
    const figures = this.figures.value();
    const fleet = this.fleet.value();
    return [
      ...(figures ? ladderTiles(figures, this.filters()) : []),
      ...(fleet ? fleetTiles(fleet, this.filters()) : []),
    ];
  });
  /** Stacked by school while several schools are shown, by grade within one. */
  protected readonly stackBy = computed(() =>
    (this.figures.value()?.studentsByRung.bySchool.length ?? 0) > 1
      ? ('school' as const)
      : ('grade' as const),
  );
  /** The chart cards, in reading order; null until the figures arrive. */
  protected readonly charts = computed((): ChartCardSpec[] | null => {
    const figures = this.figures.value();
    if (!figures) return null;
    const bySchool = figures.benchmark.bySchool.length > 1;
    const cards: (ChartCardSpec | null)[] = [
      {
        testId: 'chart-students-by-rung',
        wide: true,
        heading:
          this.stackBy() === 'school'
            ? 'Students by rung, by school'
            : 'Students by rung, by grade',
        description:
          'How far each student has climbed the scale ladder. The number on top is every student on that rung.',
        figure: studentsByRungFigure(figures, this.stackBy()),
        height: 320,
      },
      {
        testId: 'chart-benchmark-by-grade',
        heading: 'At or above benchmark, by grade',
        description:
          "Each grade's benchmark rung and date is beside it; the dashed line is all grades together.",
        figure: benchmarkByGradeFigure(figures),
        height: 340,
      },
      bySchool
        ? {
            testId: 'chart-benchmark-by-school',
            heading: 'At or above benchmark, by school',
            description:
              'Select a school to list its students below the benchmark; the dashed line is the district.',
            figure: benchmarkBySchoolFigure(figures),
            height: 340,
          }
        : null,
      {
        testId: 'chart-median-rung',
        heading: 'Median rung by grade',
        description:
          'Half the grade is on this rung or higher; beside it in brass, the rung the grade should have reached.',
        figure: medianRungFigure(figures),
      },
      {
        testId: 'chart-pass-offs-per-week',
        wide: !bySchool,
        heading: 'Pass-offs per week',
        description: 'Every pass-off heard this school year, week by week; the teal part passed.',
        figure: passOffsPerWeekFigure(figures),
      },
    ];
    return cards.filter((card) => card !== null);
  });
  protected readonly scopeLine = computed(() => {
    const me = this.me();
    const rows = this.schools.value()?.rows ?? [];
    const school =
      rows.length === 1 ? rows[0] : rows.find((row) => row.id === this.filters().schoolId);
    const grade = this.filters().grade;
    const where = school ? school.name : me?.allSchools ? 'The whole district' : 'Your schools';
    return grade === undefined
      ? `${where}, every grade.`
      : `${where}, ${gradeLabel(grade).toLowerCase()} only.`;
  });

  protected setFilter(name: 'schoolId' | 'grade', value: number | null): void {
    void this.router.navigate([], {
      queryParams: { [name]: value },
      queryParamsHandling: 'merge',
      replaceUrl: true,
    });
  }

  protected openDrill(target: DrillTarget): void {
    this.dialog.open(DrillPanel, {
      data: target,
      position: { right: '0', top: '0' },
      height: '100vh',
      width: 'min(720px, 100vw)',
      maxWidth: '100vw',
      autoFocus: 'dialog',
      ariaLabel: target.title,
    });
  }

  protected reload(): void {
    this.figures.reload();
    this.fleet.reload();
  }
}
