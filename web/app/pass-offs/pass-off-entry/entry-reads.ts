import { Injector, inject } from '@angular/core';
import { Router, type CanMatchFn } from '@angular/router';
import { CurrentUser } from '../../core/auth/current-user';
import { entryReads } from '@shared/api/entry-reads';
import { EarlyReads } from '../../core/state/early-reads';

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
