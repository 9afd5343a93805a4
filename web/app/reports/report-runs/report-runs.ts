import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { Pager } from '../../core/pager/pager';
import { PageState } from '../../core/state/page-state';
import { ReportData } from '../report-data';
import { momentText } from '../report-period';

const pageSize = 50;

/** The reports that went out, newest first: what, for when, to whom, and how. */
@Component({
  selector: 'tb-report-runs',
  imports: [MatButtonModule, Pager, PageState],
  template: `
    @if (runs.error()) {
      <tb-page-state
        kind="error"
        title="The reports sent could not be loaded"
        message="The server did not answer. Check your connection and reload the page."
      />
    } @else if (runs.isLoading() && !runs.value()) {
      <tb-page-state kind="loading" title="Loading the reports sent…" />
    } @else if (runs.value(); as list) {
      @if (list.total === 0) {
        <tb-page-state
          kind="empty"
          icon="outgoing_mail"
          title="No report has gone out yet"
          message="Preview a report and send it now, or add a schedule; each one sent is listed here."
        />
      } @else {
        <table class="tb-list-table list" data-testid="report-runs">
          <caption class="tb-visually-hidden">
            Reports sent, newest first
          </caption>
          <thead>
            <tr>
              <th scope="col">Sent</th>
              <th scope="col">Report</th>
              <th scope="col">Period</th>
              <th scope="col">To</th>
              <th scope="col">How</th>
            </tr>
          </thead>
          <tbody>
            @for (run of list.rows; track run.id) {
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
          </tbody>
        </table>
        <tb-pager
          class="pager"
          [(offset)]="offset"
          [pageSize]="pageSize"
          [shown]="list.rows.length"
          [total]="list.total"
        />
      }
    }
  `,
  styles: `
    .list {
      font-size: 0.9rem;
    }
    tbody th {
      white-space: nowrap;
    }
    td:first-child {
      white-space: nowrap;
    }
    .to {
      max-width: 420px;
      overflow-wrap: anywhere;
    }
    .pager {
      padding-top: 8px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReportRuns {
  private readonly reports = inject(ReportData);
  protected readonly pageSize = pageSize;
  protected readonly offset = signal(0);
  protected readonly runs = rxResource({
    params: () => this.offset(),
    stream: ({ params }) => this.reports.runs(params, pageSize),
  });
  protected readonly momentText = momentText;
}
