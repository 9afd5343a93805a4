import { ChangeDetectionStrategy, Component, inject, output } from '@angular/core';
import { HttpClient } from '@angular/common/http';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { map } from 'rxjs';
import { injectTypedSearch } from '../../core/state/typed-search';
import { listResponseSchema } from '@shared/api/list';
import { studentSchema, type Student } from '@shared/api/student';
import { parsedWith } from '../../core/parse';

const studentListSchema = listResponseSchema(studentSchema);

/** Finds an active student of the user's schools by name or student ID as the user types. */
@Component({
  selector: 'tb-student-picker',
  imports: [MatAutocompleteModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <mat-form-field appearance="outline" class="picker">
      <mat-label>Student</mat-label>
      <mat-icon matPrefix svgIcon="search" />
      <input
        matInput
        type="search"
        [matAutocomplete]="choices"
        #searchBox
        (input)="typed(searchBox.value)"
        placeholder="Last name, first name or student ID"
        autocomplete="off"
        data-testid="student-picker"
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
          <mat-option disabled>No active student of your schools matches.</mat-option>
        }
      </mat-autocomplete>
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
  private readonly http = inject(HttpClient);

  readonly picked = output<Student | null>();

  // The API answers only the user's own schools' students.
  protected readonly search = injectTypedSearch((q) =>
    this.http.get('/api/students', { params: { q, status: 'active', limit: 12 } }).pipe(
      parsedWith(studentListSchema),
      map((page) => page.rows),
    ),
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
