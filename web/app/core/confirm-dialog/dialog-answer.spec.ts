// Angular's packages are partially compiled: the JIT compiler links them outside a build.
import '@angular/compiler';
import type { MatDialog, MatDialogConfig } from '@angular/material/dialog';
import { Subject } from 'rxjs';
import { describe, expect, it } from 'vitest';
import { askToConfirm, ConfirmDialog, type ConfirmDialogData } from './confirm-dialog';
import { dialogAnswer } from './dialog-answer';

/** A stand-in `MatDialog` whose one dialog closes when the test says, with what it says. */
function dialogThatCloses() {
  const opened: { component: unknown; config: MatDialogConfig | undefined }[] = [];
  const closed = new Subject<unknown>();
  const dialog = {
    open: (component: unknown, config?: MatDialogConfig) => {
      opened.push({ component, config });
      return { afterClosed: () => closed };
    },
  } as unknown as MatDialog;
  const close = (result: unknown) => {
    closed.next(result);
    closed.complete();
  };
  return { dialog, opened, close };
}

const question: ConfirmDialogData = {
  title: 'Remove this pass-off?',
  paragraphs: ['Their rung is recomputed without it.'],
  confirm: 'Remove the pass-off',
};

describe('dialogAnswer', () => {
  it('should answer what the dialog closed with, after it closed', async () => {
    const { dialog, opened, close } = dialogThatCloses();
    const answer = dialogAnswer<number>(dialog, ConfirmDialog, { width: '560px' });
    expect(opened).toEqual([{ component: ConfirmDialog, config: { width: '560px' } }]);
    close(42);
    await expect(answer).resolves.toBe(42);
  });

  it('should answer undefined when the dialog was dismissed', async () => {
    const { dialog, close } = dialogThatCloses();
    const answer = dialogAnswer<number>(dialog, ConfirmDialog);
    close(undefined);
    await expect(answer).resolves.toBeUndefined();
  });
});

describe('askToConfirm', () => {
  it('should answer true when the user goes ahead, asking with the given width', async () => {
    const { dialog, opened, close } = dialogThatCloses();
    const answer = askToConfirm(dialog, question, '560px');
    expect(opened[0]?.config).toEqual({ data: question, width: '560px' });
    close(true);
    await expect(answer).resolves.toBe(true);
  });

  it('should answer false when the user cancels or dismisses the question', async () => {
    const cancelled = dialogThatCloses();
    const cancelAnswer = askToConfirm(cancelled.dialog, question);
    expect(cancelled.opened[0]?.config).toEqual({ data: question });
    cancelled.close(false);
    await expect(cancelAnswer).resolves.toBe(false);
    const dismissed = dialogThatCloses();
    const dismissAnswer = askToConfirm(dismissed.dialog, question);
    dismissed.close(undefined);
    await expect(dismissAnswer).resolves.toBe(false);
  });
});
