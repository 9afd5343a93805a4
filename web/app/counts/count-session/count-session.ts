import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  input,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { Subject, catchError, concatMap, map, of } from 'rxjs';
import type { CountScan, ScanOutcome } from '@shared/api/count';
import { errorMessage } from '../../core/parse';
import { RecordPage } from '../../core/record-page/record-page';
import { createWrite } from '../../core/state/write';
import { askToConfirm } from '../../core/confirm-dialog/confirm-dialog';
import { dayText } from '../../instruments/instrument-labels';
import { InventoryCounts } from '../count-data';
import { CountReconciliation } from './count-reconciliation';

/** What one scan's outcome says to the person holding the scanner. */
const outcomeWords: Record<ScanOutcome, { text: string; icon: string; tone: string }> = {
  found: { text: 'found where expected', icon: 'check_circle', tone: 'ok' },
  'found-elsewhere': { text: 'belongs to another school', icon: 'swap_horiz', tone: 'warn' },
  unknown: { text: 'is not in the fleet', icon: 'help', tone: 'danger' },
  duplicate: { text: 'was already scanned', icon: 'info', tone: 'info' },
};

/** The tags in what was typed or pasted: one per line, or separated by commas, tabs or spaces. */
export function tagsIn(text: string): string[] {
  return text
    .split(/[\s,;]+/)
    .map((tag) => tag.trim())
    .filter((tag) => tag.length > 0);
}

/** One count: the scan box, the live reconciliation, and closing the count. */
@Component({
  selector: 'tb-count-session',
  imports: [
    CountReconciliation,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    RecordPage,
  ],
  templateUrl: './count-session.html',
  styleUrl: './count-session.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CountSession {
  private readonly counts = inject(InventoryCounts);
  private readonly dialog = inject(MatDialog);

  /** The route's `:id`. */
  readonly id = input.required<string>();

  /** The count as read from the API, and as the last scan or the close left it. */
  protected readonly record = this.counts.detail(() => Number(this.id()));
  protected readonly count = computed(() => (this.record.hasValue() ? this.record.value() : null));
  protected readonly tagText = signal('');
  /** Tags typed and not yet answered by the server. */
  protected readonly pending = signal(0);
  protected readonly lastScans = signal<
    { scan: CountScan; text: string; icon: string; tone: string }[]
  >([]);
  protected readonly failure = signal('');
  protected readonly day = dayText;
  protected readonly open = computed(() => this.count()?.state === 'open');

  private readonly closing = createWrite();
  private readonly queue = new Subject<string>();
  private refreshTimer: ReturnType<typeof setTimeout> | undefined;

  constructor() {
    // The scans are a stream: sent one after the other, in the order the scanner typed them.
    const subscription = this.queue
      .pipe(
        concatMap((tag) =>
          this.counts.scan(this.count()!.id, tag).pipe(
            map((scan) => ({ scan, failure: '' })),
            catchError((error: unknown) =>
              of({ scan: null, failure: `${tag}: ${errorMessage(error, 'not recorded.')}` }),
            ),
          ),
        ),
      )
      // The scan stream: each tag waits for the one before it (concatMap).
      .subscribe(({ scan, failure }) => {
        this.pending.update((count) => count - 1);
        if (scan) {
          this.lastScans.update((scans) =>
            [{ scan, ...outcomeWords[scan.outcome] }, ...scans].slice(0, 8),
          );
        } else this.failure.set(failure);
        clearTimeout(this.refreshTimer);
        this.refreshTimer = setTimeout(() => this.record.reload(), 150);
      });
    inject(DestroyRef).onDestroy(() => {
      subscription.unsubscribe();
      clearTimeout(this.refreshTimer);
    });
  }

  /** Enter in the box (a scanner sends one after each tag) adds what was typed. */
  protected submit(): void {
    const tags = tagsIn(this.tagText());
    if (tags.length === 0 || !this.count()) return;
    // The box clears at once and stays usable, so a scanner can go on while tags are sent.
    this.tagText.set('');
    this.failure.set('');
    this.pending.update((count) => count + tags.length);
    for (const tag of tags) this.queue.next(tag);
  }

  /** A paste of many lines is a list of tags: add them at once. */
  protected pasted(event: ClipboardEvent): void {
    const text = event.clipboardData?.getData('text') ?? '';
    if (!/[\n\r\t,;]/.test(text.trim())) return;
    event.preventDefault();
    this.tagText.set(text);
    this.submit();
  }

  protected async closeCount(): Promise<void> {
    const count = this.count();
    if (!count) return;
    const missing = count.reconciliation.notFound.length;
    const paragraphs =
      missing === 0
        ? [
            'Every instrument expected here was found. Closing ends the count; no more tags can be added.',
          ]
        : [
            `${missing} ${missing === 1 ? 'instrument' : 'instruments'} not found will be marked missing.`,
            'Anything marked missing earlier that was scanned in this count becomes available again. No more tags can be added once the count is closed.',
          ];
    const confirmed = await askToConfirm(this.dialog, {
      title: 'Close this count?',
      paragraphs,
      confirm: missing === 0 ? 'Close the count' : `Close and mark ${missing} missing`,
      destructive: missing > 0,
    });
    if (!confirmed) return;
    this.closing.send(this.counts.close(count.id, true), {
      next: (closed) => this.record.set(closed),
      error: (error: unknown) =>
        this.failure.set(errorMessage(error, 'The count could not be closed.')),
    });
  }
}
