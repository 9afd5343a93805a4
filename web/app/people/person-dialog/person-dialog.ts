import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { startWith } from 'rxjs';
import {
  assignmentProblems,
  needsSchools,
  personInputSchema,
  type Person,
  type PersonDetail,
} from '@shared/api/person';
import { roleLabels, roles, type Role } from '@shared/api/roles';
import type { Student } from '@shared/api/student';
import { CurrentUser } from '../../core/auth/current-user';
import { Field } from '../../core/forms/field';
import { fieldMessage, saveFailureMessage, schemaValidator } from '../../core/forms/record-form';
import { injectSchoolChoices } from '../../schools/school-choices';
import { PeopleData } from '../people-data';
import { StudentPicker } from '../../loans/checkout-dialog/student-picker';
import { createDialogSave } from '../../core/state/dialog-save';

/** What the person dialog edits: a person, or null to add one. */
export interface PersonDialogData {
  person: Person | null;
}

/** What each role may do, in a line, so the coordinator picks the right one. */
const roleHints: Record<Role, string> = {
  coordinator: 'Sees and changes the whole district, including the ladder and people.',
  director: 'Works with the students, ensembles, pass-offs and loans of their schools.',
  technician: 'Looks after the district’s instruments, repairs and returns.',
  viewer: 'Reads their schools’ figures and rosters; changes nothing.',
  student: 'Sees their own progress, practice sheets and loans.',
};

/** Adds or edits a person: name, e-mail, role, and the schools or student the role needs. */
@Component({
  selector: 'tb-person-dialog',
  imports: [
    Field,
    ReactiveFormsModule,
    MatButtonModule,
    MatDialogModule,
    MatFormFieldModule,
    MatIconModule,
    MatSelectModule,
    StudentPicker,
  ],
  templateUrl: './person-dialog.html',
  styleUrl: './person-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PersonDialog {
  private readonly dialogSave = createDialogSave<PersonDetail>();
  private readonly people = inject(PeopleData);

  protected readonly person = inject<PersonDialogData>(MAT_DIALOG_DATA).person;
  protected readonly isSelf = this.person?.id === inject(CurrentUser).me()?.id;
  protected readonly roles = roles;
  protected readonly roleLabels = roleLabels;
  protected readonly roleHints = roleHints;
  protected readonly fieldMessage = fieldMessage;
  protected readonly schools = injectSchoolChoices();

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: [this.person?.email ?? '', schemaValidator(personInputSchema.shape.email)],
    name: [this.person?.name ?? '', schemaValidator(personInputSchema.shape.name)],
    role: [this.person?.role ?? ('director' as Role)],
    schoolIds: [
      this.person && needsSchools(this.person.role)
        ? this.person.schools.map((school) => school.id)
        : ([] as number[]),
    ],
    studentId: [this.person?.student?.id ?? (null as number | null)],
  });
  protected readonly role = toSignal(
    this.form.controls.role.valueChanges.pipe(startWith(this.form.controls.role.value)),
    {
      requireSync: true,
    },
  );
  protected readonly showsSchools = computed(() => needsSchools(this.role()));
  protected readonly linkedStudent = signal<{ name: string; studentNumber: string } | null>(
    this.person?.student ?? null,
  );
  protected readonly saving = this.dialogSave.saving;
  protected readonly conflict = signal(false);
  protected readonly failure = this.dialogSave.failure;

  constructor() {
    if (this.person) this.form.controls.email.disable();
    if (this.isSelf) this.form.controls.role.disable();
  }

  /** Links the student chosen in the picker; typing again keeps the link until the next pick. */
  protected studentPicked(student: Student | null): void {
    if (!student) return;
    this.form.controls.studentId.setValue(student.id);
    this.form.controls.studentId.markAsTouched();
    this.linkedStudent.set({
      name: `${student.preferredName ?? student.firstName} ${student.lastName}`,
      studentNumber: student.studentNumber,
    });
  }

  protected save(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.saving()) return;
    const value = this.form.getRawValue();
    const assignments = {
      role: value.role,
      schoolIds: needsSchools(value.role) ? value.schoolIds : [],
      studentId: value.role === 'student' ? value.studentId : null,
    };
    const problems = assignmentProblems(assignments);
    for (const problem of problems) {
      this.form.controls[problem.field].setErrors({ server: problem.message });
    }
    if (problems.length) return;
    const request = this.person
      ? this.people.update(this.person.id, {
          name: value.name,
          ...assignments,
          version: this.person.version,
        })
      : this.people.create({ email: value.email, name: value.name, ...assignments });
    this.dialogSave.send(request, (error) => saveFailureMessage(this.form, error, this.conflict));
  }
}
