import { effect, untracked, type EffectRef, type Signal } from '@angular/core';
import type { FormControl } from '@angular/forms';

/**
 * While a new record is being added, fills in its school when the user has only one to choose
 * from. Call in an injection context (a constructor or field initialiser).
 */
export function chooseOnlySchool(
  schools: Signal<readonly { id: number }[]>,
  adding: Signal<boolean>,
  control: FormControl<number | null>,
): EffectRef {
  return effect(() => {
    const choices = schools();
    if (adding() && choices.length === 1) {
      // Setting a control reads its own signals: untracked, so the effect never re-runs on typing.
      untracked(() => control.setValue(choices[0]!.id));
    }
  });
}
