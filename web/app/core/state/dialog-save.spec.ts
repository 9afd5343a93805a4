// Angular's packages are partially compiled: the JIT compiler links them outside a build.
import '@angular/compiler';
import { HttpErrorResponse } from '@angular/common/http';
import { Injector, runInInjectionContext } from '@angular/core';
import { MatDialogRef } from '@angular/material/dialog';
import { Subject } from 'rxjs';
import { describe, expect, it } from 'vitest';
import { createDialogSave } from './dialog-save';

/** A dialog's save over a stand-in dialog reference that records what it was closed with. */
function dialogSave() {
  const closedWith: string[] = [];
  const dialogRef: Pick<MatDialogRef<unknown, string>, 'close'> = {
    close: (result?: string) => {
      if (result !== undefined) closedWith.push(result);
    },
  };
  const injector = Injector.create({ providers: [{ provide: MatDialogRef, useValue: dialogRef }] });
  const save = runInInjectionContext(injector, () => createDialogSave<string>());
  return { save, closedWith };
}

const refused = new HttpErrorResponse({
  status: 400,
  error: { error: { status: 400, code: 'invalid', message: 'The due date is before today.' } },
});

describe('createDialogSave', () => {
  it('should close the dialog with the answer and stay saving until it came', () => {
    const { save, closedWith } = dialogSave();
    const answer = new Subject<string>();
    save.send(answer, 'The loan could not be saved.');
    expect(save.saving()).toBe(true);
    expect(closedWith).toEqual([]);
    answer.next('loan 7');
    answer.complete();
    expect(closedWith).toEqual(['loan 7']);
    expect(save.saving()).toBe(false);
    expect(save.failure()).toBe('');
  });

  it('should stay open with the API message when the write fails', () => {
    const { save, closedWith } = dialogSave();
    const answer = new Subject<string>();
    save.send(answer, 'The loan could not be saved.');
    answer.error(refused);
    expect(closedWith).toEqual([]);
    expect(save.saving()).toBe(false);
    expect(save.failure()).toBe('The due date is before today.');
  });

  it('should show the fallback sentence for an error without a message', () => {
    const { save } = dialogSave();
    const answer = new Subject<string>();
    save.send(answer, 'The loan could not be saved.');
    answer.error(new Error('offline'));
    expect(save.failure()).toBe('The loan could not be saved.');
  });

  it('should show the words made from the error, and clear them on the next send', () => {
    const { save } = dialogSave();
    const first = new Subject<string>();
    save.send(first, (error) => (error === refused ? 'Refused.' : 'Other.'));
    first.error(refused);
    expect(save.failure()).toBe('Refused.');
    save.send(new Subject<string>(), 'The loan could not be saved.');
    expect(save.failure()).toBe('');
  });
});
