import {
  booleanAttribute,
  ChangeDetectionStrategy,
  ChangeDetectorRef,
  Component,
  computed,
  effect,
  inject,
  input,
  model,
  type DoCheck,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatFormFieldModule, type MatFormFieldAppearance } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { FilterChoice } from '../grid/filter-select/filter-select';

/** Choices of a select under one heading, e.g. the instruments of one family. */
export interface ChoiceGroup<T> {
  label: string;
  choices: readonly FilterChoice<T>[];
}
import { fieldMessage } from './record-form';

/**
 * A field of a form: the form field (outlined unless `appearance` says otherwise), its label,
 * the `matInput` (or, given `choices` or `groups`, the `mat-select`), an optional hint, and under it the
 * field's message. A record form binds
 * `control` and the message is `fieldMessage()` (the shared schema's words, or the API's field
 * error); a dialog that keeps its values in signals binds `[(value)]` instead, and its own check
 * shows through `error`. The field owns its control rather than projecting one: `mat-form-field`
 * finds its control, label and errors only among its own content children, and `matInput` finds
 * its form field through injection, so a control projected through a wrapper is not seen (Angular
 * Material, "Creating a custom form field control"). The page sets the width on the element
 * (`class="grow"`).
 */
@Component({
  selector: 'tb-field',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  template: `
    <mat-form-field [appearance]="appearance()" [subscriptSizing]="dense() ? 'dynamic' : 'fixed'">
      <mat-label>{{ label() }}</mat-label>
      @if (prefix(); as prefix) {
        <span matTextPrefix>{{ prefix }}&nbsp;</span>
      }
      @if (choices() || groups()) {
        <mat-select
          [formControl]="bound()"
          [placeholder]="placeholder() ?? ''"
          [attr.aria-label]="ariaLabel()"
          [attr.data-testid]="testId()"
        >
          @if (noneLabel(); as none) {
            <mat-option [value]="null">{{ none }}</mat-option>
          }
          @for (choice of choices() ?? []; track choice.value) {
            <mat-option [value]="choice.value">{{ choice.label }}</mat-option>
          }
          @for (group of groups() ?? []; track group.label) {
            <mat-optgroup [label]="group.label">
              @for (choice of group.choices; track choice.value) {
                <mat-option [value]="choice.value">{{ choice.label }}</mat-option>
              }
            </mat-optgroup>
          }
        </mat-select>
      } @else if (rows(); as rows) {
        <textarea
          matInput
          [formControl]="bound()"
          [rows]="rows"
          [attr.placeholder]="placeholder()"
          [attr.data-testid]="testId()"
        ></textarea>
      } @else {
        <input
          matInput
          [type]="type()"
          [formControl]="bound()"
          [attr.autocomplete]="autocomplete()"
          [attr.inputmode]="inputMode()"
          [attr.min]="min()"
          [attr.placeholder]="placeholder()"
          [attr.data-testid]="testId()"
        />
      }
      @if (error()) {
        <mat-hint class="field-error">{{ error() }}</mat-hint>
      } @else if (hint()) {
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
    .field-error {
      color: var(--tb-danger);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Field<T = unknown> implements DoCheck {
  private readonly changes = inject(ChangeDetectorRef);

  /** The field's label, e.g. "First name". */
  readonly label = input.required<string>();
  /** The record form's control; without it the field binds `value`. */
  readonly control = input<FormControl | null>(null);
  /** The value, for a page that keeps it in a signal: `[(value)]="dueOn"`. */
  readonly value = model<T | null>(null);
  /** Whether the field is disabled, where it binds `value`. */
  readonly disabled = input(false);
  /** The input's type: 'text', 'email', 'date'. */
  readonly type = input('text');
  /** A textarea of this many rows instead of a one-line input. */
  readonly rows = input<number | null>(null);
  /** A select of these choices instead of an input. */
  readonly choices = input<readonly FilterChoice<T>[] | null>(null);
  /** A select of these choices under their headings (`mat-optgroup`) instead of an input. */
  readonly groups = input<readonly ChoiceGroup<T>[] | null>(null);
  /** The select's first choice, for no value (null), e.g. "Not recorded"; none when null. */
  readonly noneLabel = input<string | null>(null);
  readonly hint = input('');
  /** The page's own check of the value, shown in place of the hint, e.g. "Write the fee in dollars". */
  readonly error = input('');
  readonly placeholder = input<string | null>(null);
  /** Text before the value, e.g. '$' for an amount. */
  readonly prefix = input<string | null>(null);
  /** The keyboard a phone shows (HTML, "inputmode" attribute): 'decimal', 'numeric'. */
  readonly inputMode = input<string | null>(null);
  /** The earliest value of a date input (HTML, "min" attribute). */
  readonly min = input<string | null>(null);
  /** 'fill' for a field in a bar of choices above a preview, rather than in a form. */
  readonly appearance = input<MatFormFieldAppearance>('outline');
  /** No room kept under the field for a hint or message, for a dense row or a table cell. */
  readonly dense = input(false, { transform: booleanAttribute });
  /** The browser's autofill hint (HTML, "autocomplete" attribute): 'organization', 'tel'. */
  readonly autocomplete = input('off');
  /** A name for a screen reader that says more than the label, e.g. the row of a table cell. */
  readonly ariaLabel = input<string | null>(null);
  /** The input's data-testid, for browser tests. */
  readonly testId = input<string | null>(null);

  /** The control `value` is kept in where the page gives no control of its own. */
  private readonly own = new FormControl<T | null>(null);
  protected readonly bound = computed(() => this.control() ?? this.own);

  constructor() {
    effect(() => this.own.setValue(this.value(), { emitEvent: false }));
    effect(() =>
      this.disabled()
        ? this.own.disable({ emitEvent: false })
        : this.own.enable({ emitEvent: false }),
    );
    this.own.valueChanges.pipe(takeUntilDestroyed()).subscribe((value) => this.value.set(value));
  }

  /**
   * A control's errors, touched and disabled states change without a new input (the page resets,
   * disables or refuses it), so the field is checked whenever the page is, as a control written
   * straight in the page would be (angular.dev, "Skipping component subtrees": `markForCheck`).
   */
  ngDoCheck(): void {
    this.changes.markForCheck();
  }

  protected message(): string {
    return fieldMessage(this.control() ?? this.own);
  }
}
