import { HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { Subject } from 'rxjs';
import * as z from 'zod';
import { passOffInputSchema, type PassOff, type PassOffInput } from '@shared/api/pass-off';
import { unreachable } from '../core/offline/last-visit-interceptor';
import { errorMessage } from '../core/parse';
import { passOffQueueStorageKey } from './unsent-pass-offs';
import { PassOffData } from './pass-off-data';
import { createWrite } from '../core/state/write';

/** A pass-off as entered, with the client key that makes sending it again safe. */
export type EnteredPassOff = PassOffInput & { clientKey: string };

/** Where an entered pass-off is: waiting to be sent, on its way, recorded, or refused. */
export type EntryStatus = 'waiting' | 'saving' | 'saved' | 'failed';

/** One entered pass-off and what became of it. */
export interface QueueEntry {
  passOff: EnteredPassOff;
  status: EntryStatus;
  /** Why it was refused, in the server's words. */
  message: string;
  /** The pass-off as recorded, once saved. */
  saved: PassOff | null;
}

/** How many pass-offs one request carries: small batches keep each retry cheap. */
const batchSize = 25;
/** A short pause after an entry so neighbouring keystrokes travel in one request. */
const gatherPause = 250;
const firstRetry = 1000;
const longestRetry = 60_000;
const storedPassOffSchema = passOffInputSchema.extend({ clientKey: z.uuid() });
const storedSchema = z.array(storedPassOffSchema);
const storedRefusalsSchema = z.array(
  z.object({ passOff: storedPassOffSchema, message: z.string() }),
);

/**
 * The outbox of the pass-off entry grid. Every entry is kept in memory and in localStorage
 * until the server has recorded it, sent in small batches, retried with a growing pause while
 * the network or server is down, and sent at once when the browser comes back online. Each
 * entry carries a client key, so a batch that reached the server before the connection dropped
 * is answered, not recorded twice.
 */
@Injectable({ providedIn: 'root' })
export class PassOffQueue {
  private readonly write = createWrite();
  private readonly data = inject(PassOffData);
  private readonly state = signal<ReadonlyMap<string, QueueEntry>>(new Map());
  private readonly savedRows = new Subject<PassOff[]>();
  private storageKey: string | null = null;
  private inFlight = false;
  private failures = 0;
  private timer: ReturnType<typeof setTimeout> | undefined;
  /** Keys to send one at a time, after a batch with them was refused as a whole. */
  private readonly alone = new Set<string>();

  /** Every entry of this visit (and those restored from the last), by client key. */
  readonly entries = this.state.asReadonly();
  /** How many entries are not yet recorded. */
  readonly pending = computed(
    () =>
      [...this.state().values()].filter(
        (entry) => entry.status === 'waiting' || entry.status === 'saving',
      ).length,
  );
  /** Whether the last attempt found no network (or the browser says it is offline). */
  readonly offline = signal(typeof navigator !== 'undefined' && navigator.onLine === false);
  /** When the next retry is due (epoch ms), while the server is not answering. */
  readonly retryAt = signal<number | null>(null);
  /** How many entries were restored from an earlier visit. */
  readonly restored = signal(0);
  /** Pass-offs as the server recorded them, batch by batch. */
  readonly saved = this.savedRows.asObservable();

  /** Starts the queue for the signed-in user: restores what an earlier visit left unsent. */
  start(userId: number): void {
    const key = passOffQueueStorageKey(userId);
    if (this.storageKey === key) return;
    this.storageKey = key;
    window.addEventListener('online', () => {
      this.offline.set(false);
      this.failures = 0;
      this.schedule(0);
    });
    window.addEventListener('offline', () => this.offline.set(true));
    const refusals = storedRefusalsSchema.safeParse(
      JSON.parse(localStorage.getItem(`${key}.refused`) ?? '[]'),
    );
    if (refusals.success && refusals.data.length) {
      const next = new Map(this.state());
      for (const { passOff, message } of refusals.data) {
        next.set(passOff.clientKey, { passOff, status: 'failed', message, saved: null });
      }
      this.state.set(next);
    }
    const stored = storedSchema.safeParse(JSON.parse(localStorage.getItem(key) ?? '[]'));
    if (!stored.success || stored.data.length === 0) return;
    const next = new Map(this.state());
    for (const passOff of stored.data) {
      next.set(passOff.clientKey, { passOff, status: 'waiting', message: '', saved: null });
    }
    this.state.set(next);
    this.restored.set(stored.data.length);
    this.schedule(0);
  }

  /** Adds an entry (or replaces a waiting one with the same key) and sends it soon. */
  enqueue(passOff: EnteredPassOff): void {
    this.update((next) =>
      next.set(passOff.clientKey, { passOff, status: 'waiting', message: '', saved: null }),
    );
    this.schedule(gatherPause);
  }

  /** Takes back an entry that has not left yet, to change it; null when it is already on its way. */
  take(clientKey: string): EnteredPassOff | null {
    const entry = this.state().get(clientKey);
    if (!entry || entry.status !== 'waiting') return null;
    this.update((next) => next.delete(clientKey));
    return entry.passOff;
  }

  /** Drops an entry that has not left yet, or a refused one; answers whether it was dropped. */
  discard(clientKey: string): boolean {
    const entry = this.state().get(clientKey);
    if (!entry || (entry.status !== 'waiting' && entry.status !== 'failed')) return false;
    this.update((next) => next.delete(clientKey));
    return true;
  }

  /** Forgets a recorded or refused entry (after its pass-off was removed); false while it is on its way. */
  forget(clientKey: string): boolean {
    const entry = this.state().get(clientKey);
    if (!entry || entry.status === 'saving') return false;
    this.update((next) => next.delete(clientKey));
    return true;
  }

  /** Sends what is waiting now, without waiting for the next retry. */
  retryNow(): void {
    this.failures = 0;
    this.schedule(0);
  }

  /** Sends what is waiting before the page goes away; storage keeps it if that fails. */
  flushSoon(): void {
    this.schedule(0);
  }

  private schedule(delay: number): void {
    clearTimeout(this.timer);
    this.timer = setTimeout(() => this.flush(), delay);
  }

  private flush(): void {
    if (this.inFlight) return;
    const waiting = [...this.state().values()].filter((entry) => entry.status === 'waiting');
    if (waiting.length === 0) {
      this.retryAt.set(null);
      return;
    }
    if (navigator.onLine === false) {
      // The 'online' event sends them; the slow retry covers a browser that never fires it.
      this.offline.set(true);
      this.retryLater();
      return;
    }
    const first = waiting[0]!;
    const batch = this.alone.has(first.passOff.clientKey)
      ? [first]
      : waiting.filter((entry) => !this.alone.has(entry.passOff.clientKey)).slice(0, batchSize);
    const keys = batch.map((entry) => entry.passOff.clientKey);
    this.inFlight = true;
    this.setStatus(keys, 'saving');
    this.write.send(this.data.record(batch.map((entry) => entry.passOff)), {
      next: (result) => {
        this.inFlight = false;
        this.failures = 0;
        this.offline.set(false);
        this.retryAt.set(null);
        const rowsByKey = new Map(result.rows.map((row) => [row.clientKey ?? '', row]));
        this.update((next) => {
          for (const key of keys) {
            const entry = next.get(key);
            if (entry)
              next.set(key, {
                ...entry,
                status: 'saved',
                message: '',
                saved: rowsByKey.get(key) ?? null,
              });
            this.alone.delete(key);
          }
        });
        this.savedRows.next(result.rows);
        this.schedule(0);
      },
      error: (error: unknown) => {
        this.inFlight = false;
        this.refused(keys, error);
      },
    });
  }

  private refused(keys: string[], error: unknown): void {
    const status = error instanceof HttpErrorResponse ? error.status : -1;
    const retryable =
      status <= 0 || status === 401 || status === 408 || status === 429 || status >= 500;
    if (retryable) {
      if (unreachable(error)) this.offline.set(true);
      this.setStatus(keys, 'waiting');
      this.retryLater();
      return;
    }
    const fieldErrors =
      (error as { error?: { error?: { fieldErrors?: { field: string; message: string }[] } } })
        .error?.error?.fieldErrors ?? [];
    const byIndex = new Map<number, string>();
    for (const fieldError of fieldErrors) {
      const match = /^passOffs\.(\d+)/.exec(fieldError.field);
      if (match && !byIndex.has(Number(match[1])))
        byIndex.set(Number(match[1]), fieldError.message);
    }
    if (byIndex.size > 0) {
      this.update((next) =>
        keys.forEach((key, index) => {
          const entry = next.get(key);
          const message = byIndex.get(index);
          if (entry)
            next.set(key, {
              ...entry,
              status: message ? 'failed' : 'waiting',
              message: message ?? '',
            });
        }),
      );
      this.schedule(0);
      return;
    }
    if (keys.length > 1) {
      // One entry spoiled the batch (a student moved away, a reused key): find it by sending each alone.
      keys.forEach((key) => this.alone.add(key));
      this.setStatus(keys, 'waiting');
      this.schedule(0);
      return;
    }
    const message = errorMessage(error, 'The server refused this pass-off.');
    this.update((next) => {
      const entry = next.get(keys[0]!);
      if (entry) next.set(keys[0]!, { ...entry, status: 'failed', message });
    });
    this.schedule(0);
  }

  private retryLater(): void {
    const pause =
      Math.min(longestRetry, firstRetry * 2 ** this.failures) * (0.8 + Math.random() * 0.4);
    this.failures++;
    this.retryAt.set(Date.now() + pause);
    this.schedule(pause);
  }

  private setStatus(keys: string[], status: EntryStatus): void {
    this.update((next) =>
      keys.forEach((key) => {
        const entry = next.get(key);
        if (entry) next.set(key, { ...entry, status });
      }),
    );
  }

  private update(change: (next: Map<string, QueueEntry>) => unknown): void {
    const next = new Map(this.state());
    change(next);
    this.state.set(next);
    this.persist(next);
  }

  private persist(entries: ReadonlyMap<string, QueueEntry>): void {
    if (!this.storageKey) return;
    const unsent = [...entries.values()]
      .filter((entry) => entry.status === 'waiting' || entry.status === 'saving')
      .map((entry) => entry.passOff);
    // Refused entries are kept too, with the server's reason, until the director retypes or
    // clears them: an entry is never dropped without being seen.
    const refused = [...entries.values()]
      .filter((entry) => entry.status === 'failed')
      .map(({ passOff, message }) => ({ passOff, message }));
    try {
      if (unsent.length) localStorage.setItem(this.storageKey, JSON.stringify(unsent));
      else localStorage.removeItem(this.storageKey);
      if (refused.length)
        localStorage.setItem(`${this.storageKey}.refused`, JSON.stringify(refused));
      else localStorage.removeItem(`${this.storageKey}.refused`);
    } catch {
      // Storage full or blocked: the entries are still in memory and still sent.
    }
  }
}
