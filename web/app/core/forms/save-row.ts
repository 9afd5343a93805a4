import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { RecordSave } from './record-save';

/**
 * The foot of a record form: its submit button, then what came of the last save from the form's
 * `RecordSave` — "Saved." or the message of a failure. The button submits the form it stands in
 * (HTML, "Form submission": a submit button's form owner is its nearest form ancestor).
 */
@Component({
  selector: 'tb-save-row',
  imports: [MatButtonModule, MatIconModule],
  template: `
    <button
      mat-flat-button
      type="submit"
      [disabled]="save().saving()"
      [attr.data-testid]="testId()"
    >
      <mat-icon svgIcon="check" />{{ label() }}
    </button>
    @if (save().saved() && showsSaved()) {
      <span class="saved" role="status">Saved.</span>
    }
    @if (save().saveError()) {
      <span class="failed" role="alert">{{ save().saveError() }}</span>
    }
  `,
  styleUrl: './save-row.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SaveRow {
  readonly save = input.required<RecordSave>();
  /** The button's words, e.g. "Save changes". */
  readonly label = input.required<string>();
  /** Whether to say "Saved." after a save; a form that leaves the page when it adds says not. */
  readonly showsSaved = input(true);
  /** The button's data-testid, for browser tests. */
  readonly testId = input<string | null>(null);
}
