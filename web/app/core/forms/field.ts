import {
  ChangeDetectionStrategy,
  ChangeDetectorRef,
  Component,
  inject,
  input,
  type DoCheck,
} from '@angular/core';
import { ReactiveFormsModule, type FormControl } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { FilterChoice } from '../grid/filter-select/filter-select';
import { fieldMessage } from './record-form';

/**
 * A field of a record form: the outlined form field, its label, the `matInput` (or, given
 * `choices`, the `mat-select`) bound to `control`, an optional hint, and under it the control's
 * message from `fieldMessage()` (the shared schema's words, or the API's field error). The field
 * owns its control rather than projecting one: `mat-form-field` finds its control, label and
 * errors only among its own content children, and `matInput` finds its form field through
 * injection, so a control projected through a wrapper is not seen (Angular Material, "Creating a
 * custom form field control"). The page sets the width on the element (`class="grow"`).
 */
@Component({
  selector: 'tb-field',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  template: `
    <mat-form-field appearance="outline">
      <mat-label>{{ label() }}</mat-label>
      @if (choices(); as choices) {
        <mat-select [formControl]="control()" [attr.data-testid]="testId()">
          @if (noneLabel(); as none) {
            <mat-option [value]="null">{{ none }}</mat-option>
          }
          @for (choice of choices; track choice.value) {
            <mat-option [value]="choice.value">{{ choice.label }}</mat-option>
          }
        </mat-select>
      } @else if (rows(); as rows) {
        <textarea matInput [formControl]="control()" [rows]="rows"></textarea>
      } @else {
        <input
          matInput
          [type]="type()"
          [formControl]="control()"
          [attr.autocomplete]="autocomplete()"
          [attr.placeholder]="placeholder()"
          [attr.data-testid]="testId()"
        />
      }
      @if (hint()) {
        <mat-hint>{{ hint() }}</mat-hint>
      }
      <mat-error>{{ message() }}</mat-error>
    </mat-form-field>
  `,
  // The form field is a stretched flex item, as it would be straight in the form's column.
  styles: `
    :host {
      display: flex;
      flex-direction: column;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Field implements DoCheck {
  private readonly changes = inject(ChangeDetectorRef);

  /** The field's label, e.g. "First name". */
  readonly label = input.required<string>();
  readonly control = input.required<FormControl>();
  /** The input's type: 'text', 'email', 'date'. */
  readonly type = input('text');
  /** A textarea of this many rows instead of a one-line input. */
  readonly rows = input<number | null>(null);
  /** A select of these choices instead of an input. */
  readonly choices = input<readonly FilterChoice<unknown>[] | null>(null);
  /** The select's first choice, for no value (null), e.g. "Not recorded"; none when null. */
  readonly noneLabel = input<string | null>(null);
  readonly hint = input('');
  readonly placeholder = input<string | null>(null);
  /** The browser's autofill hint (HTML, "autocomplete" attribute): 'organization', 'tel'. */
  readonly autocomplete = input('off');
  /** The input's data-testid, for browser tests. */
  readonly testId = input<string | null>(null);

  /**
   * A control's errors, touched and disabled states change without a new input (the page resets,
   * disables or refuses it), so the field is checked whenever the page is, as a control written
   * straight in the page would be (angular.dev, "Skipping component subtrees": `markForCheck`).
   */
  ngDoCheck(): void {
    this.changes.markForCheck();
  }

  protected message(): string {
    return fieldMessage(this.control());
  }
}
