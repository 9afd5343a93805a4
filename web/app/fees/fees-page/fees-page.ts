import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type {
  FeeDetail,
  FeeList,
  FeeRow,
  FeeStatus,
  FeeSummary,
  Reconciliation,
} from '@shared/api/fee';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { centsOf, dayText, money } from '../../instruments/instrument-labels';
import { FeeScheduleEditor } from '../../district/fee-schedule/fee-schedule';
import { FeeLedger } from '../fee-data';

type Load<Value> =
  { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready'; value: Value };

const statusWords: Record<FeeStatus, string> = {
  none: 'No fee',
  owed: 'Owed',
  'part-paid': 'Part paid',
  paid: 'Paid',
  waived: 'Waived',
  refunded: 'Refunded',
  mismatch: 'Check amount',
};

const ledgerWords: Record<string, string> = {
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
    PageState,
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
  protected readonly list = signal<Load<FeeList>>({ kind: 'loading' });
  protected readonly summary = signal<Load<FeeSummary> | null>(null);
  protected readonly selected = signal<Load<FeeDetail> | null>(null);
  protected readonly notice = signal('');
  protected readonly reconciliation = signal<Load<Reconciliation> | null>(null);

  protected readonly query = computed(() => {
    const query: Record<string, string | number> = { limit: 500 };
    if (this.status()) query['status'] = this.status();
    if (this.search().trim()) query['q'] = this.search().trim();
    return query;
  });

  constructor() {
    this.load();
  }

  protected load(): void {
    this.list.set({ kind: 'loading' });
    this.fees.list(this.query()).subscribe({
      next: (value) => this.list.set({ kind: 'ready', value }),
      error: (error: unknown) => this.list.set({ kind: 'error', message: errorMessage(error) }),
    });
    const view = this.view();
    if (view === 'loan') {
      this.summary.set(null);
    } else {
      this.summary.set({ kind: 'loading' });
      this.fees.summary(view, this.query()).subscribe({
        next: (value) => this.summary.set({ kind: 'ready', value }),
        error: (error: unknown) =>
          this.summary.set({ kind: 'error', message: errorMessage(error) }),
      });
    }
  }

  protected setView(view: 'loan' | FeeSummary['by']): void {
    this.view.set(view);
    this.load();
  }

  protected setStatus(value: string): void {
    this.status.set(value as FeeStatus | '');
    this.load();
  }

  protected exportUrl(format: 'csv' | 'xlsx'): string {
    const { limit: _limit, ...query } = this.query();
    return this.fees.exportUrl(format, query);
  }

  protected open(row: FeeRow): void {
    this.notice.set('');
    if (!this.seesLedger) return;
    this.selected.set({ kind: 'loading' });
    this.fees.detail(row.loanId).subscribe({
      next: (value) => this.selected.set({ kind: 'ready', value }),
      error: (error: unknown) => this.selected.set({ kind: 'error', message: errorMessage(error) }),
    });
  }

  private afterChange(loanId: number, message: string): void {
    this.notice.set(message);
    this.fees.detail(loanId).subscribe((value) => this.selected.set({ kind: 'ready', value }));
    this.load();
  }

  protected refund(loanId: number, amountText: string, reason: string): void {
    const amountCents = amountText.trim() ? centsOf(amountText) : undefined;
    if (amountCents === null)
      return this.notice.set('Type the amount in dollars, or leave it empty for all of it.');
    this.fees.refund(loanId, { amountCents: amountCents ?? undefined, reason }).subscribe({
      next: (row) =>
        this.afterChange(loanId, `Refunded: ${money(row.refundedCents)} in all on this loan.`),
      error: (error: unknown) => this.notice.set(errorMessage(error)),
    });
  }

  protected recordPayment(loanId: number, amountText: string, note: string): void {
    const amountCents = centsOf(amountText);
    if (!amountCents) return this.notice.set('Type the amount received in dollars.');
    this.fees.recordPayment(loanId, amountCents, note).subscribe({
      next: () => this.afterChange(loanId, 'Payment recorded.'),
      error: (error: unknown) => this.notice.set(errorMessage(error)),
    });
  }

  protected remind(loanId: number): void {
    this.fees.remind(loanId).subscribe({
      next: (result) =>
        this.notice.set(
          result.queued ? 'Reminder queued for the guardian.' : 'No guardian e-mail on the roster.',
        ),
      error: (error: unknown) => this.notice.set(errorMessage(error)),
    });
  }

  protected reconcile(): void {
    this.reconciliation.set({ kind: 'loading' });
    this.fees.reconciliation().subscribe({
      next: (value) => this.reconciliation.set({ kind: 'ready', value }),
      error: (error: unknown) =>
        this.reconciliation.set({ kind: 'error', message: errorMessage(error) }),
    });
  }
}
