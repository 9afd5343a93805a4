import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, type AbstractControl } from '@angular/forms';
import {
  instrumentConditions,
  instrumentInputSchema,
  manualInstrumentStatuses,
  type Instrument,
  type InstrumentCondition,
} from '@shared/api/instrument';
import { Field } from '../../core/forms/field';
import { instrumentChoiceGroups } from '../../core/forms/instrument-choices';
import { SaveRow } from '../../core/forms/save-row';
import { choicesOf } from '../../core/grid/filter-select/filter-select';
import { schemaValidator } from '../../core/forms/record-form';
import { chooseOnlySchool } from '../../core/forms/only-school';
import { FleetInstruments } from '../instrument-data';
import { centsOf, conditionLabels, familyLabels, statusLooks } from '../instrument-labels';
import { ConflictNotice } from '../../core/record-page/conflict-notice';
import { SchoolRecordForm } from '../../core/forms/school-record-form';

const fields = instrumentInputSchema.shape;
type ManualStatus = (typeof manualInstrumentStatuses)[number];

function costValidator(control: AbstractControl) {
  const cents = centsOf(String(control.value ?? ''));
  return Number.isNaN(cents)
    ? { schema: 'Write the cost in dollars, e.g. 1250 or 1250.00.' }
    : null;
}

/** An instrument's record as a form; adds an instrument when given none. */
@Component({
  selector: 'tb-instrument-form',
  imports: [ConflictNotice, Field, ReactiveFormsModule, SaveRow],
  templateUrl: './instrument-form.html',
  styleUrl: './instrument-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstrumentForm extends SchoolRecordForm<Instrument, Instrument> {
  private readonly fleet = inject(FleetInstruments);

  /** The instrument being edited; null to add one. */
  readonly instrument = input<Instrument | null>(null);
  protected readonly record = this.instrument;

  protected readonly instrumentGroups = instrumentChoiceGroups(familyLabels);
  protected readonly conditions = choicesOf(
    instrumentConditions,
    (value) => conditionLabels[value],
  );
  protected readonly statuses = choicesOf(
    manualInstrumentStatuses,
    (value) => statusLooks[value].label,
  );
  /** Loans, repairs and counts set the other statuses; a person may set only these. */
  protected readonly statusSettable = computed(() => {
    const status = this.instrument()?.status;
    return status !== undefined && (manualInstrumentStatuses as readonly string[]).includes(status);
  });

  protected readonly form = inject(NonNullableFormBuilder).group({
    assetTag: ['', schemaValidator(fields.assetTag)],
    instrumentId: ['', schemaValidator(fields.instrumentId)],
    maker: [''],
    model: [''],
    serial: [''],
    purchasedOn: [''],
    purchaseCost: ['', costValidator],
    fundingSource: [''],
    condition: ['good' as InstrumentCondition],
    status: ['available' as ManualStatus],
    homeSchoolId: [null as number | null, schemaValidator(fields.homeSchoolId)],
    location: [''],
    notes: [''],
  });

  constructor() {
    super();
    chooseOnlySchool(this.schools, this.adding, this.form.controls.homeSchoolId);
  }

  protected show(instrument: Instrument): void {
    this.form.reset({
      assetTag: instrument.assetTag,
      instrumentId: instrument.instrumentId,
      maker: instrument.maker,
      model: instrument.model,
      serial: instrument.serial,
      purchasedOn: instrument.purchasedOn ?? '',
      purchaseCost:
        instrument.purchaseCostCents === null
          ? ''
          : (instrument.purchaseCostCents / 100).toFixed(2),
      fundingSource: instrument.fundingSource,
      condition: instrument.condition,
      status: this.statusSettable() ? (instrument.status as ManualStatus) : 'available',
      homeSchoolId: instrument.homeSchoolId,
      location: instrument.location,
      notes: instrument.notes,
    });
  }

  protected save(): void {
    if (!this.recordSave.ready(this.form)) return;
    const { purchaseCost, purchasedOn, status, homeSchoolId, ...values } = this.form.getRawValue();
    const record = {
      ...values,
      homeSchoolId: homeSchoolId ?? 0,
      purchasedOn: purchasedOn || null,
      purchaseCostCents: centsOf(purchaseCost),
    };
    const instrument = this.instrument();
    const request = instrument
      ? this.fleet.update(instrument.id, {
          ...record,
          ...(this.statusSettable() ? { status } : {}),
          version: instrument.version,
        })
      : this.fleet.create(instrumentInputSchema.parse(record));
    // Only an edit can be stale; a 409 while adding says why in the message.
    const conflict = instrument !== null;
    this.sendRecord(request, { conflict });
  }
}
