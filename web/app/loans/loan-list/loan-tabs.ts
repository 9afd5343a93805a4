import type { GridFilters } from '../../core/grid/grid-query';

/** One tab of the loans screen and the list filters it stands for. */
export interface LoanTab {
  id: 'active' | 'overdue' | 'unsigned' | 'returned';
  label: string;
  filters: GridFilters;
  emptyTitle: string;
  emptyMessage: string;
}

/** The tabs of the loans screen, in order. */
export const loanTabs: readonly LoanTab[] = [
  {
    id: 'active',
    label: 'Active',
    filters: { state: 'active' },
    emptyTitle: 'No instruments are out',
    emptyMessage: 'Check an instrument out to a student to start a loan.',
  },
  {
    id: 'overdue',
    label: 'Overdue',
    filters: { overdue: 'true' },
    emptyTitle: 'Nothing is overdue',
    emptyMessage: 'Every instrument out on loan is within its due date.',
  },
  {
    id: 'unsigned',
    label: 'Unsigned agreement',
    filters: { state: 'active', unsigned: 'true' },
    emptyTitle: 'Every agreement is signed',
    emptyMessage: 'Each active loan has its guardian’s signed agreement.',
  },
  {
    id: 'returned',
    label: 'Returned',
    filters: { state: 'returned' },
    emptyTitle: 'No returns yet',
    emptyMessage: 'Loans that come back are listed here.',
  },
];
