import { NgTemplateOutlet } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  Directive,
  TemplateRef,
  contentChild,
  input,
  model,
  output,
} from '@angular/core';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import type { TypedSearch } from '../state/typed-search';

/** What a `tbPickerOption` template is given: the found row. */
export interface PickerOptionContext<Row> {
  $implicit: Row;
}

/**
 * The words of one found row in a `tb-search-picker`'s list, given the picker's search so the
 * row is typed: `<ng-template [tbPickerOption]="search" let-student>…</ng-template>`.
 */
@Directive({ selector: 'ng-template[tbPickerOption]' })
export class PickerOption<Row> {
  /** The search whose rows the template draws. */
  readonly tbPickerOption = input.required<TypedSearch<Row>>();

  /** Types the template's `let-` variable as the search's row (angular.dev, "Template type checking": template guards). */
  static ngTemplateContextGuard<Row>(
    _option: PickerOption<Row>,
    _context: unknown,
  ): _context is PickerOptionContext<Row> {
    return true;
  }
}

/**
 * A record picked by searching as the user types: the outlined search field, its autocomplete
 * list of what `search` found (each row drawn by the projected `tbPickerOption` template, as
 * Material's table takes its cells from projected templates), a disabled line saying nothing
 * matches, and a hint. Typing clears the choice (`picked` emits null) until a row is chosen.
 * The student and instrument pickers are this picker with their own search and row.
 */
@Component({
  selector: 'tb-search-picker',
  imports: [
    MatAutocompleteModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    NgTemplateOutlet,
  ],
  template: `
    <mat-form-field appearance="outline" class="picker">
      <mat-label>{{ label() }}</mat-label>
      <mat-icon matPrefix svgIcon="search" />
      <input
        matInput
        type="search"
        [matAutocomplete]="choices"
        [value]="text()"
        #searchBox
        (input)="typed(searchBox.value)"
        [placeholder]="placeholder()"
        autocomplete="off"
        [attr.data-testid]="testId()"
      />
      <mat-autocomplete
        #choices="matAutocomplete"
        [displayWith]="describe()"
        (optionSelected)="picked.emit($event.option.value)"
      >
        @for (row of search().found(); track row.id) {
          <mat-option [value]="row">
            <ng-container *ngTemplateOutlet="option() ?? null; context: { $implicit: row }" />
          </mat-option>
        }
        @if (search().searched() && search().found().length === 0) {
          <mat-option disabled>{{ noMatch() }}</mat-option>
        }
      </mat-autocomplete>
      @if (hint()) {
        <mat-hint>{{ hint() }}</mat-hint>
      }
    </mat-form-field>
  `,
  styles: `
    :host {
      display: block;
    }
    .picker {
      width: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SearchPicker<Row extends { id: number }> {
  readonly label = input.required<string>();
  readonly placeholder = input('');
  /** The disabled line shown when a search finds nothing, e.g. "No active student matches." */
  readonly noMatch = input.required<string>();
  readonly hint = input('');
  /** The search run as the user types (`injectTypedSearch`). */
  readonly search = input.required<TypedSearch<Row>>();
  /** The words the field shows for the chosen row. */
  readonly describe = input.required<(row: Row | string | null) => string>();
  /** The input's data-testid, for browser tests. */
  readonly testId = input<string | null>(null);
  /** The field's text, set by the page to show a row chosen before the picker opened. */
  readonly text = model('');
  /** The chosen row, or null while the user types. */
  readonly picked = output<Row | null>();

  protected readonly option = contentChild(PickerOption, { read: TemplateRef });

  protected typed(text: string): void {
    this.text.set(text);
    this.picked.emit(null);
    this.search().typed(text);
  }
}
