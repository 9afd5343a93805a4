import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { Loan } from '@shared/api/loan';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { conditionLabels, dayText, money } from '../../instruments/instrument-labels';
import { FleetLoans } from '../loan-data';
import { returnDialog } from '../return-dialog/return-dialog';
import { createWrite } from '../../core/state/write';
import { IconButton } from '../../core/icon-button/icon-button';

/** One loan beside the grid: its details, the agreement, and what can be done with it. */
@Component({
  selector: 'tb-loan-panel',
  imports: [IconButton, MatButtonModule, MatIconModule, RouterLink],
  templateUrl: './loan-panel.html',
  styleUrl: './loan-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LoanPanel {
  private readonly write = createWrite();
  private readonly loans = inject(FleetLoans);
  private readonly dialog = inject(MatDialog);
  private readonly currentUser = inject(CurrentUser);

  readonly loan = input.required<Loan>();
  /** The loan changed (returned, reminded); null when it should no longer be shown. */
  readonly changed = output<Loan | null>();
  readonly closed = output<void>();

  protected readonly canLend = this.currentUser.can('loans:write');
  protected readonly canReturn = this.currentUser.can('loans:return');
  protected readonly conditionLabels = conditionLabels;
  protected readonly day = dayText;
  protected readonly money = money;
  protected readonly status = signal('');
  protected readonly pdfUrl = computed(() => this.loans.agreementPdfUrl(this.loan().id));
  protected readonly stateText = computed(() => {
    const loan = this.loan();
    if (loan.state === 'lost') return 'Lost';
    if (loan.state === 'returned') return `Returned ${dayText(loan.returnedOn)}`;
    return loan.overdue ? 'Out, overdue' : 'Out';
  });

  protected remind(): void {
    this.status.set('Sending…');
    this.write.send(this.loans.remind(this.loan().id), {
      next: ({ queued }) =>
        this.status.set(
          queued
            ? 'A reminder was queued for the guardian.'
            : 'No reminder was sent: the student has no guardian e-mail on file.',
        ),
      error: (error: unknown) => this.status.set(errorMessage(error)),
    });
  }

  protected resendAgreement(): void {
    this.status.set('Sending…');
    this.write.send(this.loans.resendAgreement(this.loan().id), {
      next: () =>
        this.status.set('A new agreement link was e-mailed; the earlier link no longer works.'),
      error: (error: unknown) => this.status.set(errorMessage(error)),
    });
  }

  protected async takeBack(): Promise<void> {
    const loan = await returnDialog(this.dialog, this.loan());
    if (loan) this.changed.emit(loan);
  }
}
