import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Router, RouterLink } from '@angular/router';
import type { Student } from '@shared/api/student';
import { CurrentUser } from '../../core/auth/current-user';
import { RecordPage } from '../../core/record-page/record-page';
import { injectSchoolChoices } from '../../schools/school-choices';
import { StudentForm } from '../student-form/student-form';
import { StudentData } from './student-data';
import { StudentMoves } from './student-moves';
import { StudentSeats } from './student-seats';
import { StudentYears } from './student-years';
import { statusLabels } from '../student-form/student-choices';

/** A student's record: the form, their seats, their school and its history; or a new student. */
@Component({
  selector: 'tb-student-detail',
  imports: [
    RouterLink,
    MatButtonModule,
    MatIconModule,
    RecordPage,
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
  private readonly router = inject(Router);

  /** The route's `:id`, or 'new' for the create page. */
  readonly id = input.required<string>();

  protected readonly canWrite = inject(CurrentUser).can('roster:write');
  protected readonly statusLabels = statusLabels;
  protected readonly creating = computed(() => this.id() === 'new');
  private readonly schoolChoices = injectSchoolChoices();
  protected readonly schools = computed(() =>
    this.schoolChoices().map(({ id, code, name }) => ({ id, code, name })),
  );
  protected readonly record = inject(StudentData).record(() =>
    this.creating() ? undefined : Number(this.id()),
  );
  protected readonly student = computed(() =>
    this.record.hasValue() ? this.record.value() : null,
  );
  protected readonly displayName = computed(() => {
    const student = this.student();
    return student ? `${student.preferredName ?? student.firstName} ${student.lastName}` : '';
  });

  protected reload(): void {
    this.record.reload();
  }

  protected onSaved(student: Student): void {
    if (this.creating()) void this.router.navigate(['/students', student.id, 'edit']);
    else this.reload();
  }
}
