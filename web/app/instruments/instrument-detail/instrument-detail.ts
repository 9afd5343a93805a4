import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import type { Loan } from '@shared/api/loan';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { RecordPage } from '../../core/record-page/record-page';
import { checkOutDialog } from '../../loans/checkout-dialog/checkout-dialog';
import { FleetLoans } from '../../loans/loan-data';
import { returnDialog } from '../../loans/return-dialog/return-dialog';
import { repairDialog } from '../../repairs/repair-dialog/repair-dialog';
import { injectSchoolChoices } from '../../schools/school-choices';
import { FleetInstruments } from '../instrument-data';
import { InstrumentForm } from '../instrument-form/instrument-form';
import {
  cleaningCaution,
  conditionLabels,
  dayText,
  handlingCaution,
  instrumentKindName,
  statusLooks,
} from '../instrument-labels';
import { InstrumentPhotos } from '../instrument-photos/instrument-photos';
import { InstrumentTimeline } from '../instrument-timeline/instrument-timeline';
import { createWrite } from '../../core/state/write';

/** One instrument: its record, cautions, current loan, open repairs, photos and timeline. */
@Component({
  selector: 'tb-instrument-detail',
  imports: [
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatIconModule,
    RecordPage,
    InstrumentForm,
    InstrumentPhotos,
    InstrumentTimeline,
  ],
  templateUrl: './instrument-detail.html',
  styleUrl: './instrument-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstrumentDetail {
  private readonly write = createWrite();
  private readonly fleet = inject(FleetInstruments);

  /** The route's `:id`. */
  readonly id = input.required<string>();

  private readonly dialog = inject(MatDialog);
  private readonly loans = inject(FleetLoans);
  private readonly currentUser = inject(CurrentUser);
  protected readonly canWrite = this.currentUser.can('fleet:write');
  protected readonly canLend = this.currentUser.can('loans:write');
  protected readonly canRepair = this.currentUser.can('repairs:write');
  /** Labels already used on the sheet in the printer: this one prints in the next place. */
  protected readonly usedLabels = signal(0);
  protected readonly actionError = signal('');
  protected readonly labelUrl = computed(() => {
    const instrument = this.instrument();
    const skip = Math.min(29, Math.max(0, Math.trunc(this.usedLabels()) || 0));
    return instrument ? this.fleet.labelUrl(instrument.id, skip) : '';
  });
  private readonly schoolChoices = injectSchoolChoices();
  protected readonly schools = computed(() =>
    this.schoolChoices().map(({ id, code, name }) => ({ id, code, name })),
  );
  protected readonly record = this.fleet.record(() => Number(this.id()));
  protected readonly instrument = computed(() =>
    this.record.hasValue() ? this.record.value() : null,
  );
  protected readonly kindName = computed(() => {
    const instrument = this.instrument();
    return instrument ? instrumentKindName(instrument.instrumentId, instrument.instrumentName) : '';
  });
  protected readonly look = computed(() => {
    const instrument = this.instrument();
    return instrument ? statusLooks[instrument.status] : null;
  });
  protected readonly conditionLabels = conditionLabels;
  protected readonly cleaningCaution = cleaningCaution;
  protected readonly handlingCaution = handlingCaution;
  protected readonly day = dayText;
  protected readonly cleaning = signal(false);
  protected readonly cleanError = signal('');
  protected readonly cleanedNote = signal(false);

  /** Lends the instrument: the loans' own checkout, with this instrument chosen. */
  protected async lend(): Promise<void> {
    const instrument = this.instrument();
    if (!instrument) return;
    await checkOutDialog(this.dialog, instrument);
    this.reload();
  }

  /** Takes the instrument back: the loans' own return, for its loan. */
  protected async returnIt(): Promise<void> {
    const loanId = this.instrument()?.activeLoan?.id;
    if (loanId === undefined) return;
    this.actionError.set('');
    let loan: Loan;
    try {
      loan = await firstValueFrom(this.loans.get(loanId));
    } catch (error: unknown) {
      this.actionError.set(errorMessage(error, 'The loan could not be opened.'));
      return;
    }
    await returnDialog(this.dialog, loan);
    this.reload();
  }

  /** Opens a repair ticket for the instrument. */
  protected async startRepair(): Promise<void> {
    const instrument = this.instrument();
    if (!instrument) return;
    await repairDialog(this.dialog, { repair: null, editable: true, instrument });
    this.reload();
  }

  /** Brings the record form, where the status is set, into view and focus. */
  protected toRecord(): void {
    const heading = document.getElementById('instrument-form-title');
    if (!heading) return;
    heading.scrollIntoView({ block: 'start' });
    heading.closest('form')?.querySelector<HTMLElement>('mat-select, input')?.focus();
  }

  protected reload(): void {
    this.record.reload();
  }

  protected recordCleaned(): void {
    const instrument = this.instrument();
    if (!instrument || this.cleaning()) return;
    this.cleaning.set(true);
    this.cleanError.set('');
    this.write.send(this.fleet.markCleaned(instrument.id), {
      next: () => {
        this.cleaning.set(false);
        this.cleanedNote.set(true);
        this.reload();
      },
      error: (error: unknown) => {
        this.cleaning.set(false);
        this.cleanError.set(errorMessage(error, 'The cleaning could not be recorded.'));
      },
    });
  }
}
