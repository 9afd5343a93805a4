import '../../core/screen-kit';
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
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { gradeLabel, schoolInputSchema, schoolLevels, type School } from '@shared/api/school';
import { CurrentUser } from '../../core/auth/current-user';
import { Field } from '../../core/forms/field';
import { SaveRow } from '../../core/forms/save-row';
import { choicesOf } from '../../core/grid/filter-select/filter-select';
import { schemaValidator } from '../../core/forms/record-form';
import { ConflictNotice } from '../../core/record-page/conflict-notice';
import { RecordPage } from '../../core/record-page/record-page';
import { EnsembleData } from '../../ensembles/ensemble-data';
import { injectSchoolChoices } from '../school-choices';
import { SchoolData } from '../school-data';
import { schoolLevelLabels } from '../school-labels';
import { createRecordSave } from '../../core/forms/record-save';

/** One school: its details (the coordinator edits them), its ensembles and a way to its students. */
@Component({
  selector: 'tb-school-detail',
  imports: [
    ConflictNotice,
    Field,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    ReactiveFormsModule,
    RecordPage,
    RouterLink,
    SaveRow,
  ],
  templateUrl: './school-detail.html',
  styleUrl: './school-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SchoolDetail {
  protected readonly recordSave = createRecordSave();
  private readonly schoolData = inject(SchoolData);
  private readonly router = inject(Router);

  /** The route's `:id`, or 'new' for the create page. */
  readonly id = input.required<string>();

  protected readonly canWrite = inject(CurrentUser).can('schools:write');
  protected readonly creating = computed(() => this.id() === 'new');
  private readonly schoolId = computed(() => (this.creating() ? undefined : Number(this.id())));
  protected readonly levels = choicesOf(schoolLevels, (level) => schoolLevelLabels[level]);
  protected readonly levelLabels = schoolLevelLabels;
  protected readonly record = this.schoolData.record(this.schoolId);
  protected readonly school = computed(() => (this.record.hasValue() ? this.record.value() : null));
  private readonly ensembleList = inject(EnsembleData).ofSchool(this.schoolId);
  protected readonly ensembles = computed(() =>
    this.ensembleList.hasValue()
      ? this.ensembleList.value().rows
      : this.ensembleList.error()
        ? []
        : null,
  );
  protected readonly grades = Array.from({ length: 13 }, (_, grade) => ({
    value: grade,
    label: gradeLabel(grade),
  }));
  private readonly openSchools = injectSchoolChoices({ openOnly: true });
  /** The open schools students may move up to (the school itself left out). */
  protected readonly otherSchools = computed(() =>
    this.openSchools()
      .filter((school) => school.id !== this.schoolId())
      .map(({ id, code, name }) => ({ value: id, label: `${name} (${code})` })),
  );
  protected readonly closingOn = signal(new Date().toISOString().slice(0, 10));

  protected readonly form = inject(NonNullableFormBuilder).group({
    code: ['', schemaValidator(schoolInputSchema.shape.code)],
    name: ['', schemaValidator(schoolInputSchema.shape.name)],
    level: ['middle' as School['level'], schemaValidator(schoolInputSchema.shape.level)],
    address: ['', schemaValidator(schoolInputSchema.shape.address)],
    lowestGrade: [null as number | null],
    highestGrade: [null as number | null],
    sendsToSchoolId: [null as number | null],
  });
  /** The two ends of the school's grade range, one select each. */
  protected readonly gradeEnds = [
    { label: 'Lowest grade', testId: 'lowest-grade', control: this.form.controls.lowestGrade },
    { label: 'Highest grade', testId: 'highest-grade', control: this.form.controls.highestGrade },
  ];

  constructor() {
    effect(() => {
      const school = this.school();
      if (school) untracked(() => this.show(school));
    });
  }

  /** Closes the school on the chosen day, or opens it again (closedOn null). */
  protected setClosed(closedOn: string | null): void {
    const current = this.school();
    if (!current || this.recordSave.saving()) return;
    const request = this.schoolData.update(current.id, { closedOn, version: current.version });
    this.recordSave.send(this.form, request, (school) => this.record.set(school), {
      keepNote: true,
    });
  }

  protected reload(): void {
    this.recordSave.conflict.set(false);
    this.record.reload();
    this.ensembleList.reload();
  }

  protected save(): void {
    if (!this.recordSave.ready(this.form)) return;
    const parsed = schoolInputSchema.safeParse(this.form.getRawValue());
    if (!parsed.success) {
      this.recordSave.saveError.set(parsed.error.issues[0]?.message ?? 'Check the form.');
      return;
    }
    const current = this.school();
    const { closedOn: _closedOn, ...input } = parsed.data;
    const request = current
      ? this.schoolData.update(current.id, { ...input, version: current.version })
      : this.schoolData.create(parsed.data);
    this.recordSave.send(this.form, request, (school) => {
      if (!current) {
        void this.router.navigate(['/schools', school.id]);
        return;
      }
      this.record.set(school);
      this.recordSave.saved.set(true);
    });
  }

  private show(school: School): void {
    this.form.reset({
      code: school.code,
      name: school.name,
      level: school.level,
      address: school.address,
      lowestGrade: school.lowestGrade,
      highestGrade: school.highestGrade,
      sendsToSchoolId: school.sendsToSchoolId,
    });
    if (!this.canWrite) this.form.disable();
  }
}
