import { Injector, inject } from '@angular/core';
import { Router, type CanMatchFn } from '@angular/router';
import { CurrentUser } from '../../core/auth/current-user';
import { EarlyReads, type ScreenRead } from '../../core/state/early-reads';

/** The ensembles the entry screen offers, as it asks for them. */
export const entryEnsembleQuery = { sort: 'name:asc', limit: 500 };
/** Rows per page of a pass-off read (the list API's largest page). */
export const passOffPageSize = 1000;
/** Rows of an ensemble's rung column (an ensemble seats fewer students). */
export const rungRowsLimit = 1000;

/**
 * What the entry screen reads before it can show the chosen ensemble: the ensembles, the ladder
 * in force, the ensemble's seats, the first page of its pass-offs and its students' rungs, in the
 * order and with the parameters the screen's data classes use.
 */
export function entryReads(ensembleId: number | null): ScreenRead[] {
  const reads: ScreenRead[] = [
    { url: '/api/ensembles', params: entryEnsembleQuery },
    { url: '/api/ladder' },
  ];
  if (ensembleId) {
    reads.push(
      { url: `/api/ensembles/${ensembleId}` },
      {
        url: '/api/pass-offs',
        params: { ensembleId, limit: passOffPageSize, offset: 0 },
        paged: true,
      },
      { url: '/api/analytics/students', params: { ensembleId, limit: rungRowsLimit } },
    );
  }
  return reads;
}

/**
 * A `canMatch` guard that starts the entry screen's reads as the route is matched, just after the
 * signed-in user's and beside the screen's code, and lets the route match. The server still decides:
 * a read the user may not make answers 401 or 403 as it would from the screen.
 */
export const startEntryReads: CanMatchFn = () => {
  // Who is signed in goes first (the shell's guard waits for it); the same read, started once.
  inject(CurrentUser)
    .load()
    .catch(() => undefined);
  const query = inject(Router).currentNavigation()?.extractedUrl.queryParams ?? {};
  const ensembleId = Number(query['ensemble']) || null;
  inject(EarlyReads).start(entryReads(ensembleId));
  // The device's copy of the last visit is read beside them (its code, with the shared schemas
  // that check it, loads apart so the first bundle stays small), for the screen's first paint.
  const injector = inject(Injector);
  import('./entry-device-copy')
    .then(({ EntryDeviceCopy }) => injector.get(EntryDeviceCopy).start(ensembleId))
    .catch(() => undefined);
  return true;
};
