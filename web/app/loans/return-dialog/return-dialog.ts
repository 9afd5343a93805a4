import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, type MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import type { InstrumentCondition } from '@shared/api/instrument';
import type { Loan, ReturnInput } from '@shared/api/loan';
import { instruments } from '@shared/music/instrument-data';
import { Field } from '../../core/forms/field';
import {
  cleaningCaution,
  conditionChoices,
  conditionLabels,
} from '../../instruments/instrument-labels';
import { FleetLoans } from '../loan-data';
import { createDialogSave } from '../../core/state/dialog-save';
import { dialogAnswer } from '../../core/confirm-dialog/dialog-answer';

/** Opens the return dialog for `loan`; answers the loan as returned, or undefined. */
export function returnDialog(dialog: MatDialog, loan: Loan): Promise<Loan | undefined> {
  return dialogAnswer<Loan>(dialog, ReturnDialog, { data: { loan }, width: '560px' });
}
import { DialogActions } from '../../core/dialog-actions/dialog-actions';

/** What the return dialog needs. */
export interface ReturnDialogData {
  loan: Loan;
}

/**
 * Takes a loan back: the condition it came back in; damage opens a repair ticket; a loss marks
 * the instrument missing. A wind instrument waits to be cleaned before it is lent again.
 */
@Component({
  selector: 'tb-return-dialog',
  imports: [DialogActions, Field, MatCheckboxModule, MatDialogModule, MatIconModule],
  templateUrl: './return-dialog.html',
  styleUrl: './return-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReturnDialog {
  private readonly dialogSave = createDialogSave<Loan>();
  private readonly loans = inject(FleetLoans);
  protected readonly loan = inject<ReturnDialogData>(MAT_DIALOG_DATA).loan;

  protected readonly conditionChoices = conditionChoices;
  protected readonly conditionLabels = conditionLabels;
  protected readonly cleaningCaution = cleaningCaution;
  protected readonly condition = signal<InstrumentCondition | null>(this.loan.conditionOut);
  protected readonly damaged = signal(false);
  protected readonly problem = signal('');
  protected readonly lost = signal(false);
  protected readonly notes = signal('');
  protected readonly saving = this.dialogSave.saving;
  protected readonly failure = this.dialogSave.failure;
  /** Woodwind and brass go to "to clean" when they come back (common practice, no source). */
  protected readonly isWind = ['woodwind', 'brass'].includes(
    instruments.find((kind) => kind.id === this.loan.instrumentType)?.family ?? '',
  );
  protected readonly ready = computed(
    () =>
      this.lost() ||
      (this.condition() !== null && (!this.damaged() || this.problem().trim().length >= 3)),
  );

  protected save(): void {
    if (!this.ready() || this.saving()) return;
    const input: ReturnInput = this.lost()
      ? { lost: true, notes: this.notes().trim() || undefined }
      : {
          conditionIn: this.condition() ?? undefined,
          damaged: this.damaged() ? { problem: this.problem().trim() } : undefined,
          notes: this.notes().trim() || undefined,
        };
    this.dialogSave.send(
      this.loans.returnLoan(this.loan.id, input),
      'The return could not be recorded.',
    );
  }
}
