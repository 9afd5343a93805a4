import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { Router } from '@angular/router';
import type { ColDef } from 'ag-grid-community';
import { instruments } from '@shared/music/instrument-data';
import { studentSortFields, type Student, type StudentStatus } from '@shared/api/student';
import { CurrentUser } from '../../core/auth/current-user';
import { FilterSelect, namedChoices } from '../../core/grid/filter-select/filter-select';
import { GridSearch } from '../../core/grid/grid-search/grid-search';
import { ServerGrid } from '../../core/grid/server-grid';
import { gridSource } from '../../core/grid/grid-source';
import { column, labelled, orBlank } from '../../core/grid/grid-columns';
import { ListPage } from '../../core/list-page/list-page';
import { injectSchoolChoices } from '../../schools/school-choices';
import { SchoolFilter } from '../../schools/school-filter/school-filter';
import type { SchoolYear } from '@shared/api/school-year';
import { YearPicker } from '../../school-years/year-picker/year-picker';
import { gradeChoices, statusChoices, statusLabels } from '../student-form/student-choices';

const studentColumns: ColDef<Student>[] = [
  column.field('studentNumber', 'Student ID', 115),
  column.field('lastName', 'Last name', 135, { sort: 'asc', context: { key: true } }),
  column.field('firstName', 'First name', 125, { context: { key: true } }),
  column.formatted('preferredName', 'Preferred', 110, orBlank()),
  column.amount('grade', 'Grade', 85, undefined, {
    context: { key: true },
    valueFormatter: ({ data }) => data?.gradeLabel ?? '',
  }),
  column.derived('school', 'School', 95, (row) => row.schoolCode),
  column.field('ensembles', 'Ensembles', { flex: 2, minWidth: 150 }),
  column.field('instruments', 'Instruments', { flex: 1, minWidth: 120 }),
  column.formatted('status', 'Status', 105, labelled(statusLabels)),
];

/** The students of the user's schools: search, filters, and a way into each record. */
@Component({
  selector: 'tb-student-list',
  imports: [
    ListPage,
    ServerGrid,
    GridSearch,
    FilterSelect,
    SchoolFilter,
    MatButtonModule,
    YearPicker,
  ],
  templateUrl: './student-list.html',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentList {
  private readonly router = inject(Router);

  /** `?schoolId=` from a school's page. */
  readonly schoolId = input<string | undefined>(undefined);

  protected readonly canWrite = inject(CurrentUser).can('roster:write');
  protected readonly schools = injectSchoolChoices();
  /** A past year chosen in the year picker (its students, read-only), or null for now. */
  protected readonly pastYear = signal<SchoolYear | null>(null);
  protected readonly pastYearLead = computed(() => {
    const name = this.pastYear()?.name;
    return name
      ? `The music students of ${name}, with that year's school, grade and ensembles.`
      : null;
  });
  protected readonly grades = gradeChoices;
  protected readonly statusChoices = statusChoices;
  protected readonly instrumentChoices = namedChoices(instruments);
  protected readonly search = signal('');
  protected readonly school = linkedSignal<number | null>(() => {
    const parameter = Number(this.schoolId());
    return Number.isInteger(parameter) && parameter > 0 ? parameter : null;
  });
  protected readonly grade = signal<number | null>(null);
  protected readonly status = signal<StudentStatus | null>('active');
  protected readonly instrumentId = signal<string | null>(null);
  protected readonly filters = computed(() => ({
    schoolId: this.school(),
    grade: this.grade(),
    // A past year lists everyone who was in the program then, whatever their status now.
    status: this.pastYear() === null ? this.status() : null,
    instrumentId: this.pastYear() === null ? this.instrumentId() : null,
    schoolYearId: this.pastYear()?.id ?? null,
  }));
  protected readonly source = gridSource('students', 'student', studentSortFields, studentColumns, {
    emptyMessage: 'Clear the search or import a roster.',
  });

  protected clearFilters(): void {
    this.search.set('');
    this.school.set(null);
    this.grade.set(null);
    this.status.set(null);
    this.instrumentId.set(null);
  }

  protected open(student: Student): void {
    void this.router.navigate(['/students', student.id, 'edit']);
  }
}
