import { signal, type Signal, type WritableSignal } from '@angular/core';
import type { FormGroup } from '@angular/forms';
import type { Observable } from 'rxjs';
import { createWrite } from '../state/write';
import { saveFailureMessage } from './record-form';

/**
 * A record form's saves over one `Write`: whether one is on its way, the "saved" note, the
 * conflict notice (someone else saved the record first) and the message of a failure that is
 * neither a conflict nor a field's error.
 */
export interface RecordSave {
  readonly saving: Signal<boolean>;
  /** Whether to show that the record is saved; the page sets it when its save is done. */
  readonly saved: WritableSignal<boolean>;
  /** Whether the API refused the last save because the record changed meanwhile (409). */
  readonly conflict: WritableSignal<boolean>;
  readonly saveError: WritableSignal<string>;
  /** Touches every control, so their messages show; whether the form may be sent now. */
  ready(form: FormGroup): boolean;
  /**
   * Sends `request`, after clearing the message and (unless `options.keepNote`) the note: its
   * answer goes to `next`, a failure to `options.error` or else onto the form
   * (`saveFailureMessage`), a 409 turning the conflict notice on unless `options.conflict` is
   * false (only an edit can be stale).
   */
  send<Value>(
    form: FormGroup,
    request: Observable<Value>,
    next: (value: Value) => void,
    options?: { conflict?: boolean; keepNote?: boolean; error?: (error: unknown) => void },
  ): void;
}

/** A `RecordSave` for one record page or form; needs no injection context. */
export function createRecordSave(): RecordSave {
  const write = createWrite();
  const saved = signal(false);
  const conflict = signal(false);
  const saveError = signal('');
  return {
    saving: write.saving,
    saved,
    conflict,
    saveError,
    ready(form) {
      form.markAllAsTouched();
      return !form.invalid && !write.saving();
    },
    send(form, request, next, options = {}) {
      if (!options.keepNote) saved.set(false);
      saveError.set('');
      write.send(request, {
        next,
        error: (error: unknown) => {
          if (options.error) options.error(error);
          else {
            const stale = options.conflict === false ? undefined : conflict;
            saveError.set(saveFailureMessage(form, error, stale));
          }
        },
      });
    },
  };
}
