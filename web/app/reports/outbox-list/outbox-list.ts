import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  signal,
} from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { outboxStates, type OutboxMessage } from '@shared/api/outbox';
import {
  ListTable,
  listTablePageSize,
  type ListTableWords,
} from '../../core/list-table/list-table';
import { OutboxData } from '../outbox-data';
import { OutboxState } from '../outbox-state/outbox-state';
import { momentText } from '../report-period';

/** How often the list asks again while a message waits to go out. */
export const outboxRefreshMilliseconds = 5000;

/** Every message the app sent or will send, with its delivery state; refreshes while any waits. */
@Component({
  selector: 'tb-outbox-list',
  imports: [
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
    ListTable,
    OutboxState,
  ],
  templateUrl: './outbox-list.html',
  styleUrl: './outbox-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutboxList {
  private readonly outbox = inject(OutboxData);

  protected readonly states = outboxStates;
  protected readonly stateLabels: Record<OutboxMessage['state'], string> = {
    queued: 'Queued',
    sending: 'Sending',
    sent: 'Sent',
    failed: 'Failed',
  };
  protected readonly state = signal<OutboxMessage['state'] | null>(null);
  protected readonly offset = signal(0);
  protected readonly messages = rxResource({
    params: () => ({ state: this.state(), offset: this.offset(), limit: listTablePageSize }),
    stream: ({ params }) => this.outbox.list(params),
  });
  /** Whether a message on the page still waits to go out, so the list keeps refreshing. */
  protected readonly waiting = computed(() =>
    (this.messages.value()?.rows ?? []).some(
      (message) => message.state === 'queued' || message.state === 'sending',
    ),
  );
  protected readonly momentText = momentText;
  /** The outbox as a table; the empty state names the state the list is filtered by. */
  protected readonly table = computed<ListTableWords>(() => ({
    testId: 'outbox-list',
    what: 'the outbox',
    failedMessage: 'The server did not answer. Check your connection and try again.',
    headings: ['Subject', 'To', 'Kind', 'State', 'Attempts', 'Queued', 'Sent or next attempt'],
    empty: {
      icon: 'mail',
      title: this.state() ? `No ${this.state()} messages` : 'The outbox is empty',
      message:
        'Reports, loan agreements and reminders appear here as soon as they are queued, with their delivery state.',
    },
  }));

  constructor() {
    const timer = setInterval(() => {
      if (this.waiting() && !this.messages.isLoading()) this.messages.reload();
    }, outboxRefreshMilliseconds);
    inject(DestroyRef).onDestroy(() => clearInterval(timer));
  }

  protected filter(state: OutboxMessage['state'] | null): void {
    this.state.set(state);
    this.offset.set(0);
  }
}
