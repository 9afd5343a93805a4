import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  output,
  untracked,
} from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { SchoolSummary } from '@shared/api/me';
import {
  studentInputSchema,
  studentPatchSchema,
  type Student,
  type StudentDetail,
  type StudentStatus,
} from '@shared/api/student';
import { Field } from '../../core/forms/field';
import { namedChoices } from '../../core/grid/filter-select/filter-select';
import { schemaValidator } from '../../core/forms/record-form';
import { chooseOnlySchool } from '../../core/forms/only-school';
import { StudentData } from '../student-detail/student-data';
import { gradeChoices, statusChoices } from './student-choices';
import { ConflictNotice } from '../../core/record-page/conflict-notice';
import { createRecordSave } from '../../core/forms/record-save';

const fields = studentInputSchema.shape;

/** A student's record as a form: names, grade, status and guardian; school and id when adding. */
@Component({
  selector: 'tb-student-form',
  imports: [Field, ReactiveFormsModule, MatButtonModule, MatIconModule, ConflictNotice],
  templateUrl: './student-form.html',
  styleUrl: './student-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentForm {
  protected readonly recordSave = createRecordSave();
  private readonly studentData = inject(StudentData);

  /** The record being edited; null to add a student. */
  readonly student = input<StudentDetail | null>(null);
  /** The schools a new student can join. */
  readonly schools = input<SchoolSummary[]>([]);
  /** Whether the user may change the record. */
  readonly editable = input(false);

  /** The record was saved; the answer is the row as the API now has it. */
  readonly saved = output<Student>();
  /** The user asked to load the record again after a conflict. */
  readonly reloadRequested = output<void>();

  protected readonly grades = gradeChoices;
  protected readonly statuses = statusChoices;
  protected readonly schoolChoices = computed(() => namedChoices(this.schools()));
  protected readonly adding = computed(() => this.student() === null);
  /** Guardian fields are absent from the answer for roles that may not see them. */
  protected readonly showsGuardian = computed(
    () => this.adding() || this.student()?.guardianName !== undefined,
  );

  protected readonly form = inject(NonNullableFormBuilder).group({
    schoolId: [null as number | null, schemaValidator(fields.schoolId)],
    studentNumber: ['', schemaValidator(fields.studentNumber)],
    firstName: ['', schemaValidator(fields.firstName)],
    lastName: ['', schemaValidator(fields.lastName)],
    preferredName: ['', schemaValidator(fields.preferredName)],
    grade: [6, schemaValidator(fields.grade)],
    status: ['active' as StudentStatus, schemaValidator(fields.status)],
    guardianName: ['', schemaValidator(fields.guardianName)],
    guardianEmail: ['', schemaValidator(fields.guardianEmail)],
  });

  constructor() {
    // Form methods read the controls' own signals: untracked, so typing never re-runs the reset.
    effect(() => {
      const student = this.student();
      const editable = this.editable();
      untracked(() => this.showRecord(student, editable));
    });
    chooseOnlySchool(this.schools, this.adding, this.form.controls.schoolId);
  }

  private showRecord(student: StudentDetail | null, editable: boolean): void {
    this.recordSave.conflict.set(false);
    if (student) {
      this.form.reset({
        schoolId: student.schoolId,
        studentNumber: student.studentNumber,
        firstName: student.firstName,
        lastName: student.lastName,
        preferredName: student.preferredName ?? '',
        grade: student.grade,
        status: student.status,
        guardianName: student.guardianName ?? '',
        guardianEmail: student.guardianEmail ?? '',
      });
    }
    if (editable) this.form.enable({ emitEvent: false });
    else this.form.disable({ emitEvent: false });
    if (student) this.form.controls.schoolId.disable({ emitEvent: false });
  }

  protected save(): void {
    if (!this.recordSave.ready(this.form)) return;
    const student = this.student();
    const { schoolId, ...values } = this.form.getRawValue();
    const guardian = this.showsGuardian()
      ? {}
      : { guardianName: undefined, guardianEmail: undefined };
    const request = student
      ? this.studentData.update(
          student.id,
          studentPatchSchema.parse({ ...values, ...guardian, version: student.version }),
        )
      : this.studentData.create(studentInputSchema.parse({ ...values, schoolId }));
    this.recordSave.send(this.form, request, (saved) => {
      this.recordSave.saved.set(true);
      this.saved.emit(saved);
    });
  }
}
