import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { Subject, catchError, concatMap, map, of } from 'rxjs';
import type { CountDetail, CountScan, ScanOutcome } from '@shared/api/count';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { ConfirmDialog } from '../../core/confirm-dialog/confirm-dialog';
import { dayText } from '../../instruments/instrument-labels';
import { InventoryCounts } from '../count-data';
import { CountReconciliation } from './count-reconciliation';

type Load = { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready' };

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
    PageState,
    RouterLink,
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

  protected readonly load = signal<Load>({ kind: 'loading' });
  protected readonly count = signal<CountDetail | null>(null);
  protected readonly tagText = signal('');
  /** Tags typed and not yet answered by the server. */
  protected readonly pending = signal(0);
  protected readonly lastScans = signal<
    { scan: CountScan; text: string; icon: string; tone: string }[]
  >([]);
  protected readonly failure = signal('');
  protected readonly day = dayText;
  protected readonly open = computed(() => this.count()?.state === 'open');

  private readonly queue = new Subject<string>();
  private refreshTimer: ReturnType<typeof setTimeout> | undefined;

  constructor() {
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
      .subscribe(({ scan, failure }) => {
        this.pending.update((count) => count - 1);
        if (scan) {
          this.lastScans.update((scans) =>
            [{ scan, ...outcomeWords[scan.outcome] }, ...scans].slice(0, 8),
          );
        } else this.failure.set(failure);
        clearTimeout(this.refreshTimer);
        this.refreshTimer = setTimeout(() => this.fetch(Number(this.id())), 150);
      });
    inject(DestroyRef).onDestroy(() => {
      subscription.unsubscribe();
      clearTimeout(this.refreshTimer);
    });
    effect(() => {
      const id = Number(this.id());
      untracked(() => this.fetch(id));
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

  protected closeCount(): void {
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
    this.dialog
      .open(ConfirmDialog, {
        data: {
          title: 'Close this count?',
          paragraphs,
          confirm: missing === 0 ? 'Close the count' : `Close and mark ${missing} missing`,
          destructive: missing > 0,
        },
      })
      .afterClosed()
      .subscribe((confirmed?: boolean) => {
        if (!confirmed) return;
        this.counts.close(count.id, true).subscribe({
          next: (closed) => this.count.set(closed),
          error: (error: unknown) =>
            this.failure.set(errorMessage(error, 'The count could not be closed.')),
        });
      });
  }

  private fetch(id: number): void {
    this.counts.get(id).subscribe({
      next: (count) => {
        this.count.set(count);
        this.load.set({ kind: 'ready' });
      },
      error: (error: unknown) =>
        this.load.set({
          kind: 'error',
          message: errorMessage(error, 'The count could not be loaded.'),
        }),
    });
  }
}
