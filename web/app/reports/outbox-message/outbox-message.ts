import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatTabsModule } from '@angular/material/tabs';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { MailFrame } from '../mail-frame/mail-frame';
import { OutboxData } from '../outbox-data';
import { OutboxState } from '../outbox-state/outbox-state';
import { momentText } from '../report-period';
import { createWrite } from '../../core/state/write';

/** One outbox message: who it went to, how delivery went, both of its parts, and a resend. */
@Component({
  selector: 'tb-outbox-message',
  imports: [
    RouterLink,
    MatButtonModule,
    MatIconModule,
    MatTabsModule,
    PageState,
    MailFrame,
    OutboxState,
  ],
  templateUrl: './outbox-message.html',
  styleUrl: './outbox-message.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutboxMessage {
  private readonly write = createWrite();
  private readonly outbox = inject(OutboxData);
  /** The message id from the route. */
  readonly id = input.required<string>();

  protected readonly message = rxResource({
    params: () => Number(this.id()),
    stream: ({ params }) => this.outbox.get(params),
  });
  protected readonly resending = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly loadProblem = computed(() =>
    errorMessage(
      this.message.error(),
      'The server did not answer. Check your connection and try again.',
    ),
  );
  protected readonly momentText = momentText;

  protected resend(): void {
    this.resending.set(true);
    this.problem.set(null);
    this.write.send(this.outbox.resend(Number(this.id())), {
      next: (message) => {
        this.resending.set(false);
        this.message.set(message);
      },
      error: (failure: unknown) => {
        this.resending.set(false);
        this.problem.set(
          errorMessage(failure, 'The message could not be queued again. Try again.'),
        );
      },
    });
  }

  /** A size in bytes as kB. */
  protected size(bytes: number): string {
    return `${Math.max(1, Math.round(bytes / 1024))} kB`;
  }
}
