import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { CurrentUser } from '../../core/auth/current-user';
import { LoanList } from '../loan-list/loan-list';
import { MyLoans } from '../my-loans/my-loans';

/** Loans: the staff screen for those who read loans, a student's own list otherwise. */
@Component({
  selector: 'tb-loans-page',
  imports: [LoanList, MyLoans],
  template: `
    @if (staff) {
      <tb-loan-list [tab]="tab()" [initialSearch]="q() ?? ''" />
    } @else {
      <tb-my-loans />
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LoansPage {
  protected readonly staff = inject(CurrentUser).can('loans:read');
  /** `?tab=` active, overdue, unsigned or returned. */
  readonly tab = input<string | undefined>(undefined);
  /** `?q=` a search to start with, such as an asset tag. */
  readonly q = input<string | undefined>(undefined);
}
