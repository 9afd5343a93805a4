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
import { MatIconModule } from '@angular/material/icon';
import { Router, RouterLink } from '@angular/router';
import type { ColDef } from 'ag-grid-community';
import { instruments } from '@shared/music/instrument-data';
import { studentSortFields, type Student, type StudentStatus } from '@shared/api/student';
import { CurrentUser } from '../../core/auth/current-user';
import { FilterSelect, namedChoices } from '../../core/grid/filter-select/filter-select';
import { GridSearch } from '../../core/grid/grid-search/grid-search';
import { ServerGrid } from '../../core/grid/server-grid';
import { injectSchoolChoices } from '../../schools/school-choices';
import { SchoolFilter } from '../../schools/school-filter/school-filter';
import type { SchoolYear } from '@shared/api/school-year';
import { YearPicker } from '../../school-years/year-picker/year-picker';
import { gradeChoices, statusChoices, statusLabels } from '../student-form/student-choices';

/** The students of the user's schools: search, filters, and a way into each record. */
@Component({
  selector: 'tb-student-list',
  imports: [
    ServerGrid,
    GridSearch,
    FilterSelect,
    SchoolFilter,
    MatButtonModule,
    MatIconModule,
    RouterLink,
    YearPicker,
  ],
  templateUrl: './student-list.html',
  styles: `
    .filters {
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
    }
    .search {
      width: 300px;
    }
  `,
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
  protected readonly pastYearName = computed(() => this.pastYear()?.name ?? null);
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
  protected readonly sortFields = studentSortFields;
  protected readonly columns: ColDef<Student>[] = [
    { field: 'studentNumber', headerName: 'Student ID', width: 115 },
    { field: 'lastName', headerName: 'Last name', width: 135, sort: 'asc', context: { key: true } },
    { field: 'firstName', headerName: 'First name', width: 125, context: { key: true } },
    {
      field: 'preferredName',
      headerName: 'Preferred',
      width: 110,
      valueFormatter: ({ value }) => value ?? '',
    },
    {
      field: 'grade',
      headerName: 'Grade',
      width: 85,
      type: 'rightAligned',
      context: { key: true },
      valueFormatter: ({ data }) => data?.gradeLabel ?? '',
    },
    {
      colId: 'school',
      headerName: 'School',
      width: 95,
      valueGetter: ({ data }) => data?.schoolCode,
    },
    { field: 'ensembles', headerName: 'Ensembles', flex: 2, minWidth: 150 },
    { field: 'instruments', headerName: 'Instruments', flex: 1, minWidth: 120 },
    {
      field: 'status',
      headerName: 'Status',
      width: 105,
      valueFormatter: ({ value }) => statusLabels[value as StudentStatus] ?? '',
    },
  ];

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
