import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import {
  ListTable,
  listTablePageSize,
  type ListTableWords,
} from '../../core/list-table/list-table';
import { ReportData } from '../report-data';
import { momentText } from '../report-period';

/** The reports sent as a table: its words, columns and empty state. */
const table: ListTableWords = {
  testId: 'report-runs',
  what: 'the reports sent',
  headings: ['Sent', 'Report', 'Period', 'To', 'How'],
  empty: {
    icon: 'outgoing_mail',
    title: 'No report has gone out yet',
    message: 'Preview a report and send it now, or add a schedule; each one sent is listed here.',
  },
};

/** The reports that went out, newest first: what, for when, to whom, and how. */
@Component({
  selector: 'tb-report-runs',
  imports: [ListTable],
  template: `
    <tb-list-table class="list" [table]="table" [list]="runs" [(offset)]="offset">
      <caption class="tb-visually-hidden">
        Reports sent, newest first
      </caption>
      @for (run of runs.value()?.rows; track run.id) {
        <tr>
          <td>{{ momentText(run.createdAt) }}</td>
          <th scope="row">
            {{
              run.kind === 'director'
                ? 'Director report · ' + (run.schoolCode ?? '')
                : 'District summary'
            }}
          </th>
          <td>{{ run.from }} to {{ run.to }}</td>
          <td class="to">{{ run.recipients.join(', ') }}</td>
          <td>{{ run.scheduleId === null ? 'Sent by hand' : 'On a schedule' }}</td>
        </tr>
      }
    </tb-list-table>
  `,
  styles: `
    .list {
      --tb-list-table-text: 0.9rem;
    }
    th {
      white-space: nowrap;
    }
    td:first-child {
      white-space: nowrap;
    }
    .to {
      max-width: 420px;
      overflow-wrap: anywhere;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReportRuns {
  private readonly reports = inject(ReportData);
  protected readonly table = table;
  protected readonly offset = signal(0);
  protected readonly runs = rxResource({
    params: () => this.offset(),
    stream: ({ params }) => this.reports.runs(params, listTablePageSize),
  });
  protected readonly momentText = momentText;
}
