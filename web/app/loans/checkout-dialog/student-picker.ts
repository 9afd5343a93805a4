import { ChangeDetectionStrategy, Component, inject, input, output } from '@angular/core';
import { PickerOption, SearchPicker } from '../../core/forms/search-picker';
import { injectTypedSearch } from '../../core/state/typed-search';
import type { Student } from '@shared/api/student';
import { StudentData } from '../../students/student-detail/student-data';

/** Finds an active student of the user's schools by name or student ID as the user types. */
@Component({
  selector: 'tb-student-picker',
  imports: [PickerOption, SearchPicker],
  template: `
    <tb-search-picker
      [label]="label()"
      placeholder="Last name, first name or student ID"
      [noMatch]="noMatch()"
      [hint]="hint()"
      [search]="search"
      [describe]="describe"
      [testId]="testId()"
      (picked)="picked.emit($event)"
    >
      <ng-template [tbPickerOption]="search" let-student>
        <strong>{{ student.preferredName ?? student.firstName }} {{ student.lastName }}</strong>
        · grade {{ student.gradeLabel }} · {{ student.schoolCode }} ·
        {{ student.studentNumber }}
      </ng-template>
    </tb-search-picker>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentPicker {
  private readonly students = inject(StudentData);

  readonly label = input('Student');
  readonly noMatch = input('No active student of your schools matches.');
  readonly hint = input('');
  /** How many students a search lists at the most. */
  readonly limit = input(12);
  readonly testId = input('student-picker');
  /** The chosen student, or null while the user types. */
  readonly picked = output<Student | null>();

  protected readonly search = injectTypedSearch((text) =>
    this.students.findActive(text, this.limit()),
  );
  protected readonly describe = (student: Student | string | null) =>
    typeof student === 'string'
      ? student
      : student
        ? `${student.preferredName ?? student.firstName} ${student.lastName} (${student.studentNumber})`
        : '';
}
