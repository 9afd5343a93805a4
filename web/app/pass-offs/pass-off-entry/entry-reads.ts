import { inject } from '@angular/core';
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
  inject(EarlyReads).start(entryReads(Number(query['ensemble']) || null));
  return true;
};
