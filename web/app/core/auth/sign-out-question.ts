import '../screen-kit';
import type { Injector } from '@angular/core';
import { MatDialog } from '@angular/material/dialog';
import { askToConfirm, type ConfirmDialogData } from '../confirm-dialog/confirm-dialog';

/**
 * Asks before signing out while pass-offs wait to be sent; answers true to sign out. Loaded only
 * when there is something to ask, so the dialog stays out of the first screen's bundle.
 */
export async function askToSignOutWithUnsent(injector: Injector, unsent: number): Promise<boolean> {
  const one = unsent === 1;
  const count = one ? '1 pass-off' : `${unsent} pass-offs`;
  const data: ConfirmDialogData = {
    title: `Sign out with ${count} not sent?`,
    paragraphs: [
      `${count} entered on this device ${one ? 'has' : 'have'} not reached the server yet. Stay signed in with this page open while online to send ${one ? 'it' : 'them'}.`,
      `If you sign out now, ${one ? 'it stays' : 'they stay'} on this device only and ${one ? 'is' : 'are'} sent the next time you sign in here and open Pass-offs.`,
    ],
    confirm: 'Sign out anyway',
    destructive: true,
  };
  return askToConfirm(injector.get(MatDialog), data);
}
