import { ChangeDetectionStrategy, Component, inject, input, output } from '@angular/core';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { injectTypedSearch } from '../../core/state/typed-search';
import type { Student } from '@shared/api/student';
import { StudentData } from '../../students/student-detail/student-data';

/** Finds an active student of the user's schools by name or student ID as the user types. */
@Component({
  selector: 'tb-student-picker',
  imports: [MatAutocompleteModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <mat-form-field appearance="outline" class="picker">
      <mat-label>{{ label() }}</mat-label>
      <mat-icon matPrefix svgIcon="search" />
      <input
        matInput
        type="search"
        [matAutocomplete]="choices"
        #searchBox
        (input)="typed(searchBox.value)"
        placeholder="Last name, first name or student ID"
        autocomplete="off"
        [attr.data-testid]="testId()"
      />
      <mat-autocomplete
        #choices="matAutocomplete"
        [displayWith]="describe"
        (optionSelected)="picked.emit($event.option.value)"
      >
        @for (student of search.found(); track student.id) {
          <mat-option [value]="student">
            <strong>{{ student.preferredName ?? student.firstName }} {{ student.lastName }}</strong>
            · grade {{ student.gradeLabel }} · {{ student.schoolCode }} ·
            {{ student.studentNumber }}
          </mat-option>
        }
        @if (search.searched() && search.found().length === 0) {
          <mat-option disabled>{{ noMatch() }}</mat-option>
        }
      </mat-autocomplete>
      @if (hint()) {
        <mat-hint>{{ hint() }}</mat-hint>
      }
    </mat-form-field>
  `,
  styles: `
    .picker {
      width: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentPicker {
  private readonly students = inject(StudentData);

  readonly label = input('Student');
  /** The line shown when no student matches the text. */
  readonly noMatch = input('No active student of your schools matches.');
  readonly hint = input('');
  /** How many students a search offers at the most. */
  readonly limit = input(12);
  readonly testId = input('student-picker');
  /** The chosen student; null as soon as the text changes. */
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

  protected typed(text: string): void {
    this.picked.emit(null);
    this.search.typed(text);
  }
}
