import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { FeeRow, FeeStatus, FeeSummary } from '@shared/api/fee';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { ResourceState } from '../../core/state/resource-state';
import { createWrite } from '../../core/state/write';
import { centsOf, dayText, money } from '../../instruments/instrument-labels';
import { FeeScheduleEditor } from '../../district/fee-schedule/fee-schedule';
import { FeeLedger } from '../fee-data';

const statusWords: Record<FeeStatus, string> = {
  none: 'No fee',
  owed: 'Owed',
  'part-paid': 'Part paid',
  paid: 'Paid',
  waived: 'Waived',
  refunded: 'Refunded',
  mismatch: 'Check amount',
};

const ledgerWords: Partial<Record<string, string>> = {
  payment: 'Paid online',
  'manual-payment': 'Paid by hand',
  refund: 'Refund',
  mismatch: 'Payment to check (amount differs)',
};

/**
 * The business office's view of usage fees: owed, paid, waived and refunded per loan, student,
 * school and year; a loan's ledger with refunds and payments by hand; the reconciliation against
 * the payment service. The fee schedule is edited in the district settings.
 */
@Component({
  selector: 'tb-fees-page',
  imports: [
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
    ResourceState,
    FeeScheduleEditor,
  ],
  templateUrl: './fees-page.html',
  styleUrl: './fees-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FeesPage {
  private readonly fees = inject(FeeLedger);
  private readonly user = inject(CurrentUser);

  protected readonly money = money;
  protected readonly day = dayText;
  protected readonly statusWords: Record<string, string> = statusWords;
  protected readonly ledgerWords = ledgerWords;
  protected readonly statuses = Object.keys(statusWords) as FeeStatus[];
  protected readonly isCoordinator = this.user.can('fees:manage');
  protected readonly editsSettings = this.user.can('district:settings');
  protected readonly seesLedger = this.user.can('loans:see-waivers');

  protected readonly view = signal<'loan' | FeeSummary['by']>('loan');
  protected readonly status = signal<FeeStatus | ''>('');
  protected readonly search = signal('');
  /** The loan whose ledger is open, if any. */
  protected readonly selectedLoan = signal<number | undefined>(undefined);
  protected readonly notice = signal('');
  /** Whether the reconciliation has been asked for. */
  private readonly reconciling = signal(false);
  private readonly write = createWrite();

  protected readonly query = computed(() => {
    const query: Record<string, string | number> = { limit: 500 };
    if (this.status()) query['status'] = this.status();
    if (this.search().trim()) query['q'] = this.search().trim();
    return query;
  });

  protected readonly list = this.fees.list(this.query);
  protected readonly summary = this.fees.summary(() => {
    const view = this.view();
    return view === 'loan' ? undefined : view;
  }, this.query);
  protected readonly selected = this.fees.detail(this.selectedLoan);
  protected readonly reconciliation = this.fees.reconciliation(this.reconciling);
  protected readonly errorMessage = errorMessage;

  protected setView(view: 'loan' | FeeSummary['by']): void {
    this.view.set(view);
  }

  protected setStatus(value: string): void {
    this.status.set(value as FeeStatus | '');
  }

  protected exportUrl(format: 'csv' | 'xlsx'): string {
    const { limit: _limit, ...query } = this.query();
    return this.fees.exportUrl(format, query);
  }

  protected open(row: FeeRow): void {
    this.notice.set('');
    if (!this.seesLedger) return;
    if (this.selectedLoan() === row.loanId) this.selected.reload();
    else this.selectedLoan.set(row.loanId);
  }

  private afterChange(message: string): void {
    this.notice.set(message);
    this.selected.reload();
    this.list.reload();
    this.summary.reload();
  }

  protected refund(loanId: number, amountText: string, reason: string): void {
    const amountCents = amountText.trim() ? centsOf(amountText) : undefined;
    if (amountCents === null)
      return this.notice.set('Type the amount in dollars, or leave it empty for all of it.');
    this.write.send(this.fees.refund(loanId, { amountCents: amountCents ?? undefined, reason }), {
      next: (row) => this.afterChange(`Refunded: ${money(row.refundedCents)} in all on this loan.`),
      error: (error: unknown) => this.notice.set(errorMessage(error)),
    });
  }

  protected recordPayment(loanId: number, amountText: string, note: string): void {
    const amountCents = centsOf(amountText);
    if (!amountCents) return this.notice.set('Type the amount received in dollars.');
    this.write.send(this.fees.recordPayment(loanId, amountCents, note), {
      next: () => this.afterChange('Payment recorded.'),
      error: (error: unknown) => this.notice.set(errorMessage(error)),
    });
  }

  protected remind(loanId: number): void {
    this.write.send(this.fees.remind(loanId), {
      next: (result) =>
        this.notice.set(
          result.queued ? 'Reminder queued for the guardian.' : 'No guardian e-mail on the roster.',
        ),
      error: (error: unknown) => this.notice.set(errorMessage(error)),
    });
  }

  protected reconcile(): void {
    if (this.reconciling()) this.reconciliation.reload();
    else this.reconciling.set(true);
  }
}
