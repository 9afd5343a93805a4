import { DestroyRef, inject, signal, type Signal } from '@angular/core';
import { Subject, catchError, debounceTime, of, switchMap, type Observable } from 'rxjs';

/** What a search-as-you-type field shows: the rows found and whether a search has answered. */
export interface TypedSearch<Row> {
  readonly found: Signal<readonly Row[]>;
  /** Whether the rows are a search's answer (so an empty list means "nothing matches"). */
  readonly searched: Signal<boolean>;
  /** The field's text changed: searches for it, or clears the rows when it is blank. */
  typed(text: string): void;
}

/**
 * A search run as the user types, through `search` (a read whose failure finds nothing). Each
 * text waits 200 ms for the next keystroke (`debounceTime`) and cancels the search before it
 * (`switchMap`). Call it in an injection context: it stops when its component is destroyed.
 */
export function injectTypedSearch<Row>(
  search: (text: string) => Observable<readonly Row[]>,
): TypedSearch<Row> {
  const texts = new Subject<string>();
  const found = signal<readonly Row[]>([]);
  const searched = signal(false);
  const subscription = texts
    .pipe(
      debounceTime(200),
      switchMap((text) => search(text).pipe(catchError(() => of([])))),
    )
    // Typed text is a stream: debounced, and each new search cancels the last (switchMap).
    .subscribe((rows) => {
      found.set(rows);
      searched.set(true);
    });
  inject(DestroyRef).onDestroy(() => subscription.unsubscribe());
  return {
    found: found.asReadonly(),
    searched: searched.asReadonly(),
    typed(text: string): void {
      if (text.trim()) texts.next(text.trim());
      else {
        found.set([]);
        searched.set(false);
      }
    },
  };
}
