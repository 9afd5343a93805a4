import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { OutboxMessage } from '@shared/api/outbox';

const looks: Record<OutboxMessage['state'], { icon: string; label: string }> = {
  queued: { icon: 'schedule', label: 'Queued' },
  sending: { icon: 'schedule_send', label: 'Sending' },
  sent: { icon: 'mark_email_read', label: 'Sent' },
  failed: { icon: 'error', label: 'Failed' },
};

/** A message's delivery state as an icon and a word, never by colour alone. */
@Component({
  selector: 'tb-outbox-state',
  imports: [MatIconModule],
  template: `<span class="state" [class]="state()"
    ><mat-icon [svgIcon]="look().icon" aria-hidden="true" />{{ look().label }}</span
  >`,
  styles: `
    .state {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      padding: 2px 10px 2px 6px;
      border-radius: 999px;
      font-size: 0.8rem;
      font-weight: 600;
      white-space: nowrap;
      mat-icon {
        width: 16px;
        height: 16px;
      }
    }
    .queued,
    .sending {
      background: #fff1d6;
      color: #5a3a00;
      mat-icon {
        fill: #5a3a00;
      }
    }
    .sent {
      background: #dcefe0;
      color: #1f4d24;
      mat-icon {
        fill: #1f4d24;
      }
    }
    .failed {
      background: #ffdad6;
      color: #8c1111;
      mat-icon {
        fill: #8c1111;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutboxState {
  readonly state = input.required<OutboxMessage['state']>();
  protected readonly look = computed(() => looks[this.state()]);
}
