import { computed, signal, type Signal } from '@angular/core';
import type { Observable } from 'rxjs';
import { errorMessage } from '../parse';

/** What a page does with the answers of one write. */
export interface WriteHandlers<Value> {
  /** Each value the write answers with (an `HttpClient` call answers once). */
  next?: (value: Value) => void;
  /** The write failed: the error, as `HttpClient` reports it. */
  error?: (error: unknown) => void;
  /** The write finished without failing. */
  complete?: () => void;
}

/**
 * A page's writes as signals. `send()` is the one place the web subscribes to a write's
 * observable (`HttpClient` calls are cold: nothing is sent until someone subscribes, see
 * angular.dev/guide/http/making-requests); the page reads `saving()`, `error()` and `done()`.
 * Writes sent while one runs are not cancelled: `saving()` stays on until all have answered.
 */
export interface Write {
  /** Whether a write is on its way. */
  readonly saving: Signal<boolean>;
  /** The error of the last write that failed, or undefined once a write starts or succeeds. */
  readonly error: Signal<unknown>;
  /** The API's message for `error()` (the shared error body), or '' without one. */
  readonly failure: Signal<string>;
  /** Whether the last write finished without failing. */
  readonly done: Signal<boolean>;
  /** Sends `request` and reports its answers to `handlers`. */
  send<Value>(request: Observable<Value>, handlers?: WriteHandlers<Value>): void;
}

/** A `Write` for one page, dialog or panel; needs no injection context. */
export function createWrite(): Write {
  const running = signal(0);
  const error = signal<unknown>(undefined);
  const done = signal(false);
  return {
    saving: computed(() => running() > 0),
    error: error.asReadonly(),
    failure: computed(() => (error() === undefined ? '' : errorMessage(error()))),
    done: done.asReadonly(),
    send<Value>(request: Observable<Value>, handlers: WriteHandlers<Value> = {}): void {
      running.update((count) => count + 1);
      error.set(undefined);
      done.set(false);
      // The one place a write is subscribed: HttpClient calls are cold, sent on subscribe.
      request.subscribe({
        next: (value) => handlers.next?.(value),
        error: (failed: unknown) => {
          running.update((count) => count - 1);
          error.set(failed);
          handlers.error?.(failed);
        },
        complete: () => {
          running.update((count) => count - 1);
          done.set(true);
          handlers.complete?.();
        },
      });
    },
  };
}
