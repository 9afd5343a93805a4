import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { InstrumentEvent, InstrumentEventKind } from '@shared/api/instrument';
import { dayText } from '../instrument-labels';

/** Each timeline entry in words, with its icon. */
const eventLooks: Record<InstrumentEventKind, { label: string; icon: string }> = {
  purchase: { label: 'Purchased', icon: 'shopping_cart' },
  added: { label: 'Added to the fleet', icon: 'add' },
  'loan-out': { label: 'Lent out', icon: 'handshake' },
  return: { label: 'Returned', icon: 'keyboard_return' },
  'repair-open': { label: 'Repair opened', icon: 'build' },
  'repair-close': { label: 'Repair closed', icon: 'task_alt' },
  'condition-change': { label: 'Condition changed', icon: 'edit' },
  cleaned: { label: 'Cleaned and sanitised', icon: 'sanitizer' },
  'count-found': { label: 'Found in a count', icon: 'barcode_scanner' },
  'marked-missing': { label: 'Marked missing', icon: 'help' },
};

const timeFormat = new Intl.DateTimeFormat('en-US', { hour: 'numeric', minute: '2-digit' });

/** An instrument's life, newest first: purchase, loans, returns, repairs, cleaning and counts. */
@Component({
  selector: 'tb-instrument-timeline',
  imports: [MatIconModule],
  template: `
    <h2 id="timeline-title">Timeline</h2>
    @if (entries().length === 0) {
      <p class="tb-muted">Nothing has happened to this instrument yet.</p>
    } @else {
      <ol aria-labelledby="timeline-title" data-testid="timeline">
        @for (entry of entries(); track entry.id) {
          <li [attr.data-kind]="entry.kind">
            <span class="mark" aria-hidden="true"><mat-icon [svgIcon]="entry.icon" /></span>
            <div>
              <div class="what">
                <strong>{{ entry.label }}</strong>
                <time [attr.datetime]="entry.at">{{ entry.day }} · {{ entry.time }}</time>
              </div>
              @if (entry.studentName) {
                <p data-testid="timeline-student">
                  {{ entry.studentName }} <span class="tb-muted">({{ entry.studentNumber }})</span>
                </p>
              }
              @if (entry.note) {
                <p>{{ entry.note }}</p>
              }
              @if (entry.userName) {
                <p class="tb-muted by">by {{ entry.userName }}</p>
              }
            </div>
          </li>
        }
      </ol>
    }
  `,
  styles: `
    h2 {
      margin: 0 0 12px;
      font-size: 1.05rem;
      font-weight: 600;
    }
    ol {
      list-style: none;
      margin: 0;
      padding: 0;
    }
    li {
      display: grid;
      grid-template-columns: 32px 1fr;
      gap: 10px;
      padding-bottom: 14px;
      position: relative;
    }
    li:not(:last-child)::before {
      content: '';
      position: absolute;
      left: 15px;
      top: 32px;
      bottom: 0;
      border-left: 2px solid var(--tb-line);
    }
    .mark {
      display: grid;
      place-items: center;
      width: 32px;
      height: 32px;
      border-radius: 50%;
      background: #ddf2f3;
      mat-icon {
        width: 18px;
        height: 18px;
        fill: var(--tb-teal-deep);
      }
    }
    .what {
      display: flex;
      flex-wrap: wrap;
      gap: 4px 12px;
      align-items: baseline;
      padding-top: 5px;
    }
    time {
      font-size: 0.85rem;
      color: var(--tb-text-muted);
    }
    p {
      margin: 2px 0 0;
      line-height: 1.4;
    }
    .by {
      font-size: 0.85rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstrumentTimeline {
  readonly events = input.required<InstrumentEvent[]>();

  protected readonly entries = computed(() =>
    [...this.events()]
      .sort((first, second) => second.at.localeCompare(first.at) || second.id - first.id)
      .map((event) => ({
        ...event,
        ...eventLooks[event.kind],
        day: dayText(event.at),
        time: timeFormat.format(new Date(event.at)),
      })),
  );
}
