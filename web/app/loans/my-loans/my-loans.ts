import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { PageState } from '../../core/state/page-state';
import { ResourceState } from '../../core/state/resource-state';
import { dayText } from '../../instruments/instrument-labels';
import { FleetLoans } from '../loan-data';

/** A student's own loans: what they have out, when it is due, and their cautions. */
@Component({
  selector: 'tb-my-loans',
  imports: [MatIconModule, PageState, ResourceState],
  template: `
    <div class="tb-page">
      <header class="tb-page-header">
        <div>
          <h1>My instruments</h1>
          <p>The school instruments lent to you.</p>
        </div>
      </header>
      @if (loans.hasValue()) {
        @for (loan of loans.value().rows; track loan.id) {
          <article class="tb-card loan" data-testid="my-loan">
            <h2>
              {{ loan.instrumentName }} · <span class="tb-asset-tag">{{ loan.assetTag }}</span>
            </h2>
            <p>
              @if (loan.state === 'active') {
                Due back {{ day(loan.dueOn) }}
                @if (loan.overdue) {
                  <span class="late"
                    ><mat-icon svgIcon="event_busy" aria-hidden="true" />Overdue: please bring it
                    back</span
                  >
                }
              } @else if (loan.state === 'returned') {
                Returned {{ day(loan.returnedOn) }}
              } @else {
                Reported lost
              }
            </p>
            @if (loan.accessories.length > 0) {
              <p class="tb-muted">With: {{ loan.accessories.join(', ') }}</p>
            }
            @for (caution of loan.cautions; track $index) {
              <p class="caution" role="note">{{ caution }}</p>
            }
          </article>
        } @empty {
          <tb-page-state
            kind="empty"
            icon="piano"
            title="No instruments are lent to you"
            message="Your music director lends school instruments; ask them if you need one."
          />
        }
      } @else {
        <tb-resource-state
          [resource]="loans"
          loading="Loading your loans…"
          failed="Your loans could not be loaded"
          fallback="Try again later."
        />
      }
    </div>
  `,
  styles: `
    @use '../../../theme/icon-label';

    .loan {
      margin-bottom: 12px;
      max-width: 44rem;
      h2 {
        margin: 0 0 6px;
        font-size: 1.05rem;
        font-weight: 600;
      }
      p {
        margin: 4px 0;
      }
    }
    .late {
      margin-left: 8px;
      font-weight: 600;
      color: var(--tb-danger);
      @include icon-label.icon-label {
        fill: var(--tb-danger);
      }
    }
    .caution {
      padding: 8px 10px;
      border-left: 4px solid var(--tb-brass);
      background: #fbf3e4;
      border-radius: 4px;
      font-size: 0.9rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MyLoans {
  /** The server answers a student only their own loans. */
  protected readonly loans = inject(FleetLoans).recent(50);
  protected readonly day = dayText;
}
