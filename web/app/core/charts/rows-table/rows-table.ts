import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { RouterLink } from '@angular/router';
import type { RowTable } from './row-cells';

/**
 * The rows behind a figure (students, pass-offs, instruments, loans) as a plain table ruled below
 * each row, its head row staying in view while the rows scroll.
 */
@Component({
  selector: 'tb-rows-table',
  imports: [RouterLink],
  templateUrl: './rows-table.html',
  styleUrl: './rows-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RowsTable {
  readonly table = input.required<RowTable>();
  /** Whether every cell stays on one line, its figures in even widths. */
  readonly oneLine = input(false);
}
