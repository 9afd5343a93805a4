import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatChipsModule } from '@angular/material/chips';
import {
  MatDialogModule,
  MatDialogRef,
  MAT_DIALOG_DATA,
  type MatDialog,
} from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import type { Instrument, InstrumentCondition } from '@shared/api/instrument';
import type { CheckoutInput, Loan } from '@shared/api/loan';
import type { Student } from '@shared/api/student';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { InstrumentPicker } from '../../instruments/instrument-picker/instrument-picker';
import { centsOf, conditionChoices, dayText } from '../../instruments/instrument-labels';
import { Field } from '../../core/forms/field';
import { FeeLedger } from '../../fees/fee-data';
import { FleetLoans } from '../loan-data';
import { accessoriesFor } from './accessories';
import { StudentPicker } from './student-picker';
import { createWrite } from '../../core/state/write';
import { dialogAnswer } from '../../core/confirm-dialog/dialog-answer';

/**
 * Opens the check-out dialog, with `instrument` chosen when it opens from the instrument's own
 * page; answers the loan made, or undefined when none was.
 */
export function checkOutDialog(
  dialog: MatDialog,
  instrument?: Instrument,
): Promise<Loan | undefined> {
  return dialogAnswer<Loan>(dialog, CheckoutDialog, {
    ...(instrument ? { data: { instrument } } : {}),
    width: '720px',
    maxWidth: '94vw',
    maxHeight: '92vh',
  });
}
import { DialogActions } from '../../core/dialog-actions/dialog-actions';

/**
 * Lends an available instrument to a student: due date, accessories, condition, fee or waiver.
 * The server e-mails the guardian a one-time link to read and sign the agreement.
 */
@Component({
  selector: 'tb-checkout-dialog',
  imports: [
    DialogActions,
    Field,
    InstrumentPicker,
    MatButtonModule,
    MatCheckboxModule,
    MatChipsModule,
    MatDialogModule,
    MatIconModule,
    StudentPicker,
  ],
  templateUrl: './checkout-dialog.html',
  styleUrl: './checkout-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CheckoutDialog {
  private readonly write = createWrite();
  private readonly loans = inject(FleetLoans);
  protected readonly dialog = inject<MatDialogRef<CheckoutDialog, Loan>>(MatDialogRef);

  /** Coordinator and directors may waive the fee; the server hides waivers from other roles. */
  protected readonly canWaive = inject(CurrentUser).can('loans:see-waivers');
  protected readonly conditionChoices = conditionChoices;
  protected readonly day = dayText;
  /** The instrument to lend, when the dialog opens from the instrument's own page. */
  private readonly given = inject<{ instrument?: Instrument } | null>(MAT_DIALOG_DATA, {
    optional: true,
  });
  protected readonly instrument = signal<Instrument | null>(this.given?.instrument ?? null);
  protected readonly student = signal<Student | null>(null);
  protected readonly dueOn = signal('');
  protected readonly accessories = signal<string[]>([]);
  protected readonly condition = signal<InstrumentCondition>('good');
  protected readonly fee = signal('');
  protected readonly waiver = signal(false);
  protected readonly waiverReason = signal('');
  protected readonly saving = this.write.saving;
  protected readonly failure = signal('');
  protected readonly lent = signal<Loan | null>(null);
  protected readonly today = new Date().toISOString().slice(0, 10);

  protected readonly accessoryChoices = computed(() =>
    accessoriesFor(this.instrument()?.instrumentId ?? null),
  );
  /** The fee the district's schedule gives for the chosen instrument and student. */
  protected readonly quote = inject(FeeLedger).quote(() => {
    const instrument = this.instrument();
    const student = this.student();
    return instrument && student
      ? { instrumentId: instrument.id, studentId: student.id }
      : undefined;
  });
  /** The scheduled fee in cents; null where no schedule line covers the instrument. */
  protected readonly scheduledCents = computed(() =>
    this.quote.hasValue() ? this.quote.value().feeCents : null,
  );
  protected readonly scheduledText = computed(() => {
    const cents = this.scheduledCents();
    return cents === null ? '' : `$${(cents / 100).toFixed(2)}`;
  });
  /** A fee may be typed only once the quote says the schedule has no line for the instrument. */
  protected readonly handEntered = computed(
    () => this.quote.hasValue() && this.quote.value().feeCents === null,
  );
  protected readonly waiverReasons = computed(() =>
    this.quote.hasValue() ? this.quote.value().waiverReasons : [],
  );
  protected readonly waiverChoices = computed(() =>
    this.waiverReasons().map((reason) => ({ value: reason, label: reason })),
  );
  protected readonly feeCents = computed(() => centsOf(this.fee()));
  protected readonly feeInvalid = computed(
    () => this.handEntered() && Number.isNaN(this.feeCents()),
  );
  protected readonly ready = computed(
    () =>
      this.instrument() !== null &&
      this.student() !== null &&
      this.quote.hasValue() &&
      !this.feeInvalid() &&
      !(this.waiver() && !this.waiverReason()),
  );
  /** Whom the agreement went to, as the confirmation says it. */
  protected readonly guardianLine = computed(() => {
    const student = this.student();
    if (!student?.guardianEmail) return null;
    return student.guardianName
      ? `${student.guardianName} (${student.guardianEmail})`
      : student.guardianEmail;
  });

  protected pickInstrument(instrument: Instrument | null): void {
    this.instrument.set(instrument);
    if (!instrument) return;
    this.condition.set(instrument.condition);
    this.accessories.set(accessoriesFor(instrument.instrumentId).filter((name) => name === 'case'));
  }

  protected lend(): void {
    const instrument = this.instrument();
    const student = this.student();
    if (!instrument || !student || !this.ready() || this.saving()) return;
    const waived = this.canWaive && this.waiver();
    const input: CheckoutInput = {
      instrumentId: instrument.id,
      studentId: student.id,
      dueOn: this.dueOn() || undefined,
      accessories: this.accessories(),
      conditionOut: this.condition(),
      usageFeeCents: waived || !this.handEntered() ? 0 : (this.feeCents() ?? 0),
      waiver: waived,
      waiverReason: waived ? this.waiverReason() || undefined : undefined,
    };
    this.failure.set('');
    this.write.send(this.loans.checkOut(input), {
      next: (loan) => {
        this.lent.set(loan);
      },
      error: (error: unknown) => {
        this.failure.set(errorMessage(error, 'The instrument could not be checked out.'));
      },
    });
  }
}
