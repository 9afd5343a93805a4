import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatTabsModule } from '@angular/material/tabs';
import { Router, RouterLink } from '@angular/router';
import type { ColDef } from 'ag-grid-community';
import { loanSortFields, type Loan } from '@shared/api/loan';
import { CurrentUser } from '../../core/auth/current-user';
import { GridSearch } from '../../core/grid/grid-search/grid-search';
import { ServerGrid } from '../../core/grid/server-grid';
import { gridSource } from '../../core/grid/grid-source';
import { column } from '../../core/grid/grid-columns';
import { ListPage } from '../../core/list-page/list-page';
import { errorMessage } from '../../core/parse';
import { askToConfirm } from '../../core/confirm-dialog/confirm-dialog';
import { withIcon } from '../../instruments/icon-text-cell/icon-text-cell';
import { dayText } from '../../instruments/instrument-labels';
import { checkOutDialog } from '../checkout-dialog/checkout-dialog';
import { FleetLoans } from '../loan-data';
import { LoanPanel } from '../loan-panel/loan-panel';
import { loanTabs, type LoanTab } from './loan-tabs';
import { createWrite } from '../../core/state/write';

const columns: ColDef<Loan>[] = [
  column.field('assetTag', 'Asset tag', 125),
  column.field('instrumentName', 'Instrument', 150),
  column.field('studentName', 'Student', { flex: 1, minWidth: 160 }),
  column.field('schoolCode', 'School', 100),
  column.formatted('checkedOutOn', 'Out since', 130, dayText, { sort: 'desc' }),
  column.field('dueOn', 'Due', 205, {
    valueFormatter: ({ value, data }) =>
      `${dayText(value as string)}${data?.overdue ? ' (overdue)' : ''}`,
    ...withIcon((loan) => (loan.overdue ? { icon: 'event_busy', tone: 'danger' } : null)),
  }),
  column.derived('agreement', 'Agreement', 150, (loan) => (loan.signed ? 'Signed' : 'Not signed'), {
    ...withIcon((loan) =>
      loan.signed ? { icon: 'draw', tone: 'ok' } : { icon: 'pending', tone: 'warn' },
    ),
  }),
  column.formatted('returnedOn', 'Returned', 130, dayText, { hide: true }),
];

/** The loans of the user's schools, by tab, with check-out, returns and reminders. */
@Component({
  selector: 'tb-loan-list',
  imports: [
    ListPage,
    RouterLink,
    ServerGrid,
    GridSearch,
    LoanPanel,
    MatButtonModule,
    MatIconModule,
    MatTabsModule,
  ],
  templateUrl: './loan-list.html',
  styleUrl: './loan-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LoanList {
  private readonly write = createWrite();
  private readonly dialog = inject(MatDialog);
  private readonly loans = inject(FleetLoans);
  private readonly router = inject(Router);
  private readonly grid = viewChild(ServerGrid);
  private readonly currentUser = inject(CurrentUser);

  /** The tab named in the address. */
  readonly tab = input<string | undefined>(undefined);
  readonly initialSearch = input('');

  protected readonly canLend = this.currentUser.can('loans:write');
  protected readonly editsSettings = this.currentUser.can('district:settings');
  protected readonly tabs = loanTabs;
  protected readonly current = computed<LoanTab>(
    () => loanTabs.find((tab) => tab.id === this.tab()) ?? loanTabs[0]!,
  );
  protected readonly search = linkedSignal(() => this.initialSearch());
  protected readonly selected = signal<Loan | null>(null);
  protected readonly notice = signal('');
  protected readonly source = gridSource('loans', 'loan', loanSortFields, columns);

  protected showTab(tab: LoanTab): void {
    this.selected.set(null);
    void this.router.navigate([], { queryParams: { tab: tab.id }, queryParamsHandling: 'merge' });
  }

  protected open(loan: Loan): void {
    this.selected.set(loan);
  }

  /** A loan changed in the panel: show it as it is now and fetch the list again. */
  protected changed(loan: Loan | null): void {
    this.selected.set(loan);
    this.grid()?.refresh();
  }

  protected async checkOut(): Promise<void> {
    const loan = await checkOutDialog(this.dialog);
    if (!loan) return;
    this.selected.set(loan);
    this.grid()?.refresh();
  }

  protected async remindAllOverdue(): Promise<void> {
    const confirmed = await askToConfirm(this.dialog, {
      title: 'Remind every overdue loan?',
      paragraphs: [
        'Each guardian of an overdue loan in your schools gets an e-mail asking for the instrument back. Loans reminded in the last day are skipped.',
      ],
      confirm: 'Send reminders',
    });
    if (!confirmed) return;
    this.notice.set('Sending reminders…');
    this.write.send(this.loans.remindOverdue(), {
      next: ({ queued }) =>
        this.notice.set(
          queued === 0
            ? 'No reminders were needed.'
            : `${queued} ${queued === 1 ? 'reminder was' : 'reminders were'} queued for e-mail.`,
        ),
      error: (error: unknown) =>
        this.notice.set(errorMessage(error, 'The reminders could not be sent.')),
    });
  }
}
