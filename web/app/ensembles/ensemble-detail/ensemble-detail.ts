import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  untracked,
} from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { Router, RouterLink } from '@angular/router';
import {
  ensembleInputSchema,
  ensembleKindLabels,
  ensembleKinds,
  type EnsembleDetail as Detail,
  type EnsembleKind,
} from '@shared/api/ensemble';
import { CurrentUser } from '../../core/auth/current-user';
import { Field } from '../../core/forms/field';
import { SaveRow } from '../../core/forms/save-row';
import { choicesOf, namedChoices } from '../../core/grid/filter-select/filter-select';
import { schemaValidator } from '../../core/forms/record-form';
import { chooseOnlySchool } from '../../core/forms/only-school';
import { ConflictNotice } from '../../core/record-page/conflict-notice';
import { RecordPage } from '../../core/record-page/record-page';
import { injectSchoolChoices } from '../../schools/school-choices';
import { EnsembleData } from '../ensemble-data';
import { createRecordSave } from '../../core/forms/record-save';

/** One ensemble: its details (directors and the coordinator edit them) and its members. */
@Component({
  selector: 'tb-ensemble-detail',
  imports: [ConflictNotice, Field, ReactiveFormsModule, RecordPage, RouterLink, SaveRow],
  templateUrl: './ensemble-detail.html',
  styleUrl: './ensemble-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EnsembleDetail {
  protected readonly recordSave = createRecordSave();
  private readonly ensembleData = inject(EnsembleData);
  private readonly router = inject(Router);

  /** The route's `:id`, or 'new' for the create page. */
  readonly id = input.required<string>();

  protected readonly canWrite = inject(CurrentUser).can('roster:write');
  protected readonly creating = computed(() => this.id() === 'new');
  protected readonly schools = injectSchoolChoices();
  protected readonly schoolChoices = computed(() => namedChoices(this.schools()));
  protected readonly kinds = choicesOf(ensembleKinds, (kind) => ensembleKindLabels[kind]);
  protected readonly record = this.ensembleData.record(() =>
    this.creating() ? undefined : Number(this.id()),
  );
  protected readonly ensemble = computed(() =>
    this.record.hasValue() ? this.record.value() : null,
  );

  protected readonly form = inject(NonNullableFormBuilder).group({
    schoolId: [null as number | null, schemaValidator(ensembleInputSchema.shape.schoolId)],
    name: ['', schemaValidator(ensembleInputSchema.shape.name)],
    kind: ['concert-band' as EnsembleKind, schemaValidator(ensembleInputSchema.shape.kind)],
    level: ['', schemaValidator(ensembleInputSchema.shape.level)],
    meetingPeriod: ['', schemaValidator(ensembleInputSchema.shape.meetingPeriod)],
  });

  constructor() {
    // Form methods read the controls' own signals: untracked, so typing never re-runs these.
    effect(() => {
      const ensemble = this.ensemble();
      if (ensemble) untracked(() => this.show(ensemble));
    });
    chooseOnlySchool(this.schools, this.creating, this.form.controls.schoolId);
  }

  protected reload(): void {
    this.recordSave.conflict.set(false);
    this.record.reload();
  }

  protected save(): void {
    if (!this.recordSave.ready(this.form)) return;
    const { schoolId, ...fields } = this.form.getRawValue();
    const current = this.ensemble();
    const request = current
      ? this.ensembleData.update(current.id, { ...fields, version: current.version })
      : this.ensembleData.create(ensembleInputSchema.parse({ ...fields, schoolId }));
    this.recordSave.send(this.form, request, (ensemble) => {
      if (!current) {
        void this.router.navigate(['/ensembles', ensemble.id]);
        return;
      }
      this.recordSave.saved.set(true);
      this.reload();
    });
  }

  private show(ensemble: Detail): void {
    this.form.reset({
      schoolId: ensemble.schoolId,
      name: ensemble.name,
      kind: ensemble.kind,
      level: ensemble.level,
      meetingPeriod: ensemble.meetingPeriod,
    });
    this.form.controls.schoolId.disable();
    if (!this.canWrite) this.form.disable();
  }
}
