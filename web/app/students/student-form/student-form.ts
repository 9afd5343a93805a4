import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import {
  studentInputSchema,
  studentPatchSchema,
  type Student,
  type StudentDetail,
  type StudentStatus,
} from '@shared/api/student';
import { Field } from '../../core/forms/field';
import { SaveRow } from '../../core/forms/save-row';
import { schemaValidator } from '../../core/forms/record-form';
import { chooseOnlySchool } from '../../core/forms/only-school';
import { StudentData } from '../student-detail/student-data';
import { gradeChoices, statusChoices } from './student-choices';
import { ConflictNotice } from '../../core/record-page/conflict-notice';
import { SchoolRecordForm } from '../../core/forms/school-record-form';

const fields = studentInputSchema.shape;

/** A student's record as a form: names, grade, status and guardian; school and id when adding. */
@Component({
  selector: 'tb-student-form',
  imports: [ConflictNotice, Field, ReactiveFormsModule, SaveRow],
  templateUrl: './student-form.html',
  styleUrl: './student-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentForm extends SchoolRecordForm<StudentDetail, Student> {
  private readonly studentData = inject(StudentData);

  /** The record being edited; null to add a student. */
  readonly student = input<StudentDetail | null>(null);
  protected readonly record = this.student;

  protected readonly grades = gradeChoices;
  protected readonly statuses = statusChoices;
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
    super();
    chooseOnlySchool(this.schools, this.adding, this.form.controls.schoolId);
  }

  protected show(student: StudentDetail): void {
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
    this.form.controls.schoolId.disable({ emitEvent: false });
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
    this.sendRecord(request);
  }
}
