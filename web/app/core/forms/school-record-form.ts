import { computed, Directive, effect, input, output, untracked, type Signal } from '@angular/core';
import type { FormGroup } from '@angular/forms';
import type { SchoolSummary } from '@shared/api/me';
import type { Observable } from 'rxjs';
import { namedChoices } from '../grid/filter-select/filter-select';
import { createRecordSave } from './record-save';

/**
 * What the forms of a school's records share (an instrument's, a student's): the record given
 * (null to add one), the schools a new one can join, whether the user may change it, the save
 * with its conflict notice, and the events its page listens to. Each form extends it, as
 * Material's chip variants extend its one base chip.
 */
@Directive()
export abstract class SchoolRecordForm<Record, Saved> {
  protected readonly recordSave = createRecordSave();

  /** The schools a new record can join. */
  readonly schools = input<SchoolSummary[]>([]);
  /** Whether the user may change the record. */
  readonly editable = input(false);

  /** The record was saved; the answer is the row as the API now has it. */
  readonly saved = output<Saved>();
  /** The user asked to load the record again after a conflict. */
  readonly reloadRequested = output<void>();

  protected readonly schoolChoices = computed(() => namedChoices(this.schools()));
  /** Whether the form adds a record (it was given none). */
  protected readonly adding = computed(() => this.record() === null);

  /** The record being edited, or null to add one: the form's own named input. */
  protected abstract readonly record: Signal<Record | null>;
  protected abstract readonly form: FormGroup;

  constructor() {
    // Form methods read the controls' own signals: untracked, so typing never re-runs the reset.
    effect(() => {
      const record = this.record();
      const editable = this.editable();
      untracked(() => this.showRecord(record, editable));
    });
  }

  /** Puts `record`'s values into the form (after the form was enabled or disabled). */
  protected abstract show(record: Record): void;

  /** Sends `request` and, when it is saved, shows the note and hands the answer to the page. */
  protected sendRecord(request: Observable<Saved>, options?: { conflict?: boolean }): void {
    this.recordSave.send(
      this.form,
      request,
      (saved) => {
        this.recordSave.saved.set(true);
        this.saved.emit(saved);
      },
      options,
    );
  }

  private showRecord(record: Record | null, editable: boolean): void {
    this.recordSave.conflict.set(false);
    if (editable) this.form.enable({ emitEvent: false });
    else this.form.disable({ emitEvent: false });
    if (record) this.show(record);
  }
}
