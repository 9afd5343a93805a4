import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MAT_DIALOG_DATA, MatDialogModule, type MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatRadioModule } from '@angular/material/radio';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import type { Instrument } from '@shared/api/instrument';
import { repairCaution, repairStatuses, type Repair, type RepairStatus } from '@shared/api/repair';
import { Field } from '../../core/forms/field';
import { isConflict } from '../../core/forms/record-form';
import { choicesOf } from '../../core/grid/filter-select/filter-select';
import { ConflictNotice } from '../../core/record-page/conflict-notice';
import { errorMessage } from '../../core/parse';
import { InstrumentPicker } from '../../instruments/instrument-picker/instrument-picker';
import { centsOf } from '../../instruments/instrument-labels';
import { FleetRepairs } from '../repair-data';
import { repairStatusLooks } from '../repair-looks';
import { createDialogSave } from '../../core/state/dialog-save';
import { dialogAnswer } from '../../core/confirm-dialog/dialog-answer';
import { DialogActions } from '../../core/dialog-actions/dialog-actions';

/** What the repair dialog needs: the ticket (null to open one) and whether it may change. */
export interface RepairDialogData {
  repair: Repair | null;
  editable: boolean;
  /** The instrument a new ticket is for, when opened from the instrument's own page. */
  instrument?: Instrument;
}

const dollarsOf = (cents: number | null) => (cents === null ? '' : (cents / 100).toFixed(2));

/** Opens a repair ticket, or shows one and moves it along: sent, back, closed. */
/** Opens a repair ticket (a new one when `data.repair` is null); answers it as saved, or undefined. */
export function repairDialog(
  dialog: MatDialog,
  data: RepairDialogData,
): Promise<Repair | undefined> {
  return dialogAnswer<Repair>(dialog, RepairDialog, { data, width: '640px', maxHeight: '92vh' });
}

@Component({
  selector: 'tb-repair-dialog',
  imports: [
    ConflictNotice,
    DialogActions,
    Field,
    InstrumentPicker,
    MatDialogModule,
    MatIconModule,
    MatRadioModule,
    RouterLink,
  ],
  templateUrl: './repair-dialog.html',
  styleUrl: './repair-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RepairDialog {
  private readonly dialogSave = createDialogSave<Repair>();
  private readonly repairs = inject(FleetRepairs);
  protected readonly data = inject<RepairDialogData>(MAT_DIALOG_DATA);
  private readonly ticket = signal<Repair | null>(this.data.repair);

  protected readonly caution = repairCaution;
  protected readonly statusChoices = choicesOf(
    repairStatuses,
    (value) => repairStatusLooks[value].label,
  );
  protected readonly creating = this.data.repair === null;
  protected readonly instrument = signal<Instrument | null>(this.data.instrument ?? null);
  protected readonly problem = signal(this.data.repair?.problem ?? '');
  protected readonly inHouse = signal(this.data.repair?.inHouse ?? true);
  protected readonly vendor = signal(this.data.repair?.vendor ?? '');
  protected readonly estimate = signal(dollarsOf(this.data.repair?.estimateCents ?? null));
  protected readonly finalCost = signal(dollarsOf(this.data.repair?.finalCostCents ?? null));
  protected readonly status = signal<RepairStatus>(this.data.repair?.status ?? 'open');
  protected readonly sentOn = signal(this.data.repair?.sentOn ?? '');
  protected readonly returnedOn = signal(this.data.repair?.returnedOn ?? '');
  protected readonly notes = signal(this.data.repair?.notes ?? '');
  protected readonly saving = this.dialogSave.saving;
  protected readonly failure = this.dialogSave.failure;
  protected readonly conflict = signal(false);

  protected readonly amountsValid = computed(
    () => !Number.isNaN(centsOf(this.estimate())) && !Number.isNaN(centsOf(this.finalCost())),
  );
  protected readonly ready = computed(
    () =>
      this.problem().trim().length >= 3 &&
      this.amountsValid() &&
      (this.inHouse() || this.vendor().trim().length > 0) &&
      (!this.creating || this.instrument() !== null),
  );

  protected save(): void {
    if (!this.ready() || this.saving()) return;
    const vendor = this.inHouse() ? null : this.vendor().trim();
    const ticket = this.ticket();
    const request = ticket
      ? this.repairs.update(ticket.id, {
          problem: this.problem().trim(),
          inHouse: this.inHouse(),
          vendor,
          estimateCents: centsOf(this.estimate()),
          finalCostCents: centsOf(this.finalCost()),
          status: this.status(),
          sentOn: this.sentOn() || null,
          returnedOn: this.returnedOn() || null,
          notes: this.notes().trim(),
          version: ticket.version,
        })
      : this.repairs.create({
          instrumentId: this.instrument()!.id,
          problem: this.problem().trim(),
          inHouse: this.inHouse(),
          vendor,
          estimateCents: centsOf(this.estimate()),
          notes: this.notes().trim(),
        });
    this.dialogSave.send(request, (error) => {
      if (!isConflict(error) || !ticket)
        return errorMessage(error, 'The ticket could not be saved.');
      this.conflict.set(true);
      return '';
    });
  }

  /** After a conflict: load the ticket as it is now, losing this dialog's changes. */
  protected async reload(): Promise<void> {
    const ticket = this.ticket();
    if (!ticket) return;
    const fresh = await firstValueFrom(this.repairs.get(ticket.id));
    this.ticket.set(fresh);
    this.problem.set(fresh.problem);
    this.inHouse.set(fresh.inHouse);
    this.vendor.set(fresh.vendor ?? '');
    this.estimate.set(dollarsOf(fresh.estimateCents));
    this.finalCost.set(dollarsOf(fresh.finalCostCents));
    this.status.set(fresh.status);
    this.sentOn.set(fresh.sentOn ?? '');
    this.returnedOn.set(fresh.returnedOn ?? '');
    this.notes.set(fresh.notes);
    this.conflict.set(false);
  }
}
