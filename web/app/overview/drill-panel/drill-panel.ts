import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { DrillTarget } from '../../core/charts/chart-figure';
import { RowsTable } from '../../core/charts/rows-table/rows-table';
import { PageState } from '../../core/state/page-state';
import { errorMessage } from '../../core/parse';
import { OverviewData, type DrillRows } from '../overview-data';
import { countText } from '../overview-charts/figure-words';
import { drillTable } from './drill-table';

const pageSize = 50;

const nouns: Record<DrillRows['path'], [string, string]> = {
  '/api/analytics/students': ['student', 'students'],
  '/api/pass-offs': ['pass-off', 'pass-offs'],
  '/api/instruments': ['instrument', 'instruments'],
  '/api/loans': ['loan', 'loans'],
  '/api/analytics/retention/students': ['student', 'students'],
};

/** The rows behind one figure, in a side panel: students, pass-offs, instruments or loans. */
@Component({
  selector: 'tb-drill-panel',
  imports: [
    MatDialogModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    RowsTable,
    PageState,
  ],
  templateUrl: './drill-panel.html',
  styleUrl: './drill-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DrillPanel {
  private readonly data = inject(OverviewData);
  protected readonly target = inject<DrillTarget>(MAT_DIALOG_DATA);

  protected readonly rows = signal<DrillRows | null>(null);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  /** The rows as a table of headings and cells. */
  protected readonly table = computed(() => {
    const rows = this.rows();
    return rows ? drillTable(rows) : null;
  });

  constructor() {
    this.load(0);
  }

  /** How many rows there are, in the words of what they are: "234 students". */
  protected countText(rows: DrillRows): string {
    const [noun, plural] = nouns[rows.path];
    return countText(rows.list.total, noun, plural);
  }

  /** How many rows are shown. */
  protected shown(): number {
    return this.rows()?.list.rows.length ?? 0;
  }

  protected more(): void {
    this.load(this.shown());
  }

  private load(offset: number): void {
    const path = this.target.path;
    if (!this.data.isDrillPath(path)) {
      this.loading.set(false);
      this.error.set('These rows cannot be listed here.');
      return;
    }
    this.loading.set(true);
    // Pages accumulate ("Show more" appends each answer to the rows shown), which a resource would replace.
    this.data.rows(path, this.target.query, offset, pageSize).subscribe({
      next: (page) => {
        const before = this.rows();
        this.rows.set(
          before && offset > 0
            ? ({
                path: page.path,
                list: { total: page.list.total, rows: [...before.list.rows, ...page.list.rows] },
              } as DrillRows)
            : page,
        );
        this.loading.set(false);
      },
      error: (failure: unknown) => {
        this.error.set(errorMessage(failure, 'The list could not be loaded. Try again.'));
        this.loading.set(false);
      },
    });
  }
}
