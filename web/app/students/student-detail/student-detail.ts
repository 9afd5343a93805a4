import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Router, RouterLink } from '@angular/router';
import { catchError, map, of } from 'rxjs';
import type { Student, StudentDetail as Detail } from '../../../../shared/api/student';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { SchoolData } from '../../schools/school-data';
import { StudentForm } from '../student-form/student-form';
import { StudentData } from './student-data';
import { StudentMoves } from './student-moves';
import { StudentSeats } from './student-seats';
import { StudentYears } from './student-years';
import { statusLabels } from '../student-form/student-choices';

type Load = { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready' };

/** A student's record: the form, their seats, their school and its history; or a new student. */
@Component({
  selector: 'tb-student-detail',
  imports: [
    RouterLink,
    MatButtonModule,
    MatIconModule,
    PageState,
    StudentForm,
    StudentSeats,
    StudentMoves,
    StudentYears,
  ],
  templateUrl: './student-detail.html',
  styleUrl: './student-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentDetail {
  private readonly studentData = inject(StudentData);
  private readonly router = inject(Router);

  /** The route's `:id`, or 'new' for the create page. */
  readonly id = input.required<string>();

  protected readonly canWrite = inject(CurrentUser).can('roster:write');
  protected readonly statusLabels = statusLabels;
  protected readonly creating = computed(() => this.id() === 'new');
  protected readonly schools = toSignal(
    inject(SchoolData)
      .list({ limit: 200, sort: 'name:asc' })
      .pipe(
        map((list) => list.rows.map(({ id, code, name }) => ({ id, code, name }))),
        catchError(() => of([])),
      ),
    { initialValue: [] },
  );
  protected readonly load = signal<Load>({ kind: 'loading' });
  protected readonly student = signal<Detail | null>(null);
  protected readonly displayName = computed(() => {
    const student = this.student();
    return student ? `${student.preferredName ?? student.firstName} ${student.lastName}` : '';
  });

  constructor() {
    effect(() => {
      const id = this.id();
      untracked(() => (id === 'new' ? this.load.set({ kind: 'ready' }) : this.fetch(Number(id))));
    });
  }

  protected reload(): void {
    this.fetch(Number(this.id()));
  }

  protected onSaved(student: Student): void {
    if (this.creating()) void this.router.navigate(['/students', student.id, 'edit']);
    else this.reload();
  }

  private fetch(id: number): void {
    if (!this.student()) this.load.set({ kind: 'loading' });
    this.studentData.get(id).subscribe({
      next: (student) => {
        this.student.set(student);
        this.load.set({ kind: 'ready' });
      },
      error: (error: unknown) =>
        this.load.set({
          kind: 'error',
          message: errorMessage(error, 'The student could not be loaded.'),
        }),
    });
  }
}
