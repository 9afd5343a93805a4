import { inject, signal, type Signal, type WritableSignal } from '@angular/core';
import { MatDialogRef } from '@angular/material/dialog';
import type { Observable } from 'rxjs';
import { errorMessage } from '../parse';
import { createWrite } from './write';

/** What a dialog shows of a failed write: a fallback sentence, or words made from the error. */
export type DialogFailure = string | ((error: unknown) => string);

/**
 * A dialog's one write: `send()` closes the dialog with the write's answer, or leaves it open with
 * `failure()` set. The answer is the dialog's result (`MatDialogRef.close(result)` hands it to
 * `afterClosed()`, see material.angular.dev/components/dialog/overview).
 */
export interface DialogSave<Result> {
  /** Whether the write is on its way (until the dialog closes on success). */
  readonly saving: Signal<boolean>;
  /** The words shown under the form when the write failed; '' otherwise. */
  readonly failure: WritableSignal<string>;
  /**
   * Sends `request`: on its answer the dialog closes with it; on an error `failure()` becomes
   * the API's message (with `failed` as the fallback) or what `failed(error)` answers.
   */
  send(request: Observable<Result>, failed: DialogFailure): void;
}

/** The `DialogSave` of the dialog being built; call it where `inject()` works. */
export function createDialogSave<Result>(): DialogSave<Result> {
  const dialogRef = inject<MatDialogRef<unknown, Result>>(MatDialogRef);
  const write = createWrite();
  const failure = signal('');
  return {
    saving: write.saving,
    failure,
    send(request: Observable<Result>, failed: DialogFailure): void {
      failure.set('');
      write.send(request, {
        next: (result) => dialogRef.close(result),
        error: (error: unknown) =>
          failure.set(typeof failed === 'string' ? errorMessage(error, failed) : failed(error)),
      });
    },
  };
}
