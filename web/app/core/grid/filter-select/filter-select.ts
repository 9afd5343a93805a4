import { ChangeDetectionStrategy, Component, input, model } from '@angular/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';

/** One choice of a select (a filter, or a form field): its value and its words on screen. */
export interface FilterChoice<T> {
  value: T;
  label: string;
}

/** The choices for a list of values named by a table of labels (`statusLabels`, …). */
export function choicesOf<T extends string>(
  values: readonly T[],
  labelOf: (value: T) => string,
): FilterChoice<T>[] {
  return values.map((value) => ({ value, label: labelOf(value) }));
}

/**
 * A filter at the head of a list screen's grid (`<div tbGridFilters>`), beside `tb-grid-search`:
 * a select whose first choice (`anyLabel`, "All schools") clears the filter; its `width`, when
 * given, is the field's.
 */
@Component({
  selector: 'tb-filter-select',
  imports: [MatFormFieldModule, MatSelectModule],
  template: `
    <mat-form-field appearance="outline" subscriptSizing="dynamic" [style.width]="width()">
      <mat-label>{{ label() }}</mat-label>
      <mat-select
        [value]="value()"
        (selectionChange)="value.set($event.value)"
        [attr.data-testid]="testId() ?? 'filter-' + label().toLowerCase()"
      >
        @if (anyLabel() ?? 'Any ' + label().toLowerCase(); as any) {
          <mat-option [value]="null">{{ any }}</mat-option>
        }
        @for (choice of choices(); track choice.value) {
          <mat-option [value]="choice.value">{{ choice.label }}</mat-option>
        }
      </mat-select>
    </mat-form-field>
  `,
  // No box of its own: the form field is the filters' flex item, sized as one written there.
  styles: `
    :host {
      display: contents;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FilterSelect<T> {
  /** The field's label, e.g. "School". */
  readonly label = input.required<string>();
  /**
   * The first choice, which clears the filter (value null): "Any status" for the label "Status"
   * unless named otherwise ("All schools"); none when ''.
   */
  readonly anyLabel = input<string | null>(null);
  readonly choices = input.required<readonly FilterChoice<T>[]>();
  /** The field's width as a CSS length ("130px"); its content's when none. */
  readonly width = input<string | null>(null);
  /** The select's data-testid, for browser tests: "filter-status" for "Status" unless named. */
  readonly testId = input<string | null>(null);
  /** The chosen value, or null for every row. */
  readonly value = model<T | null>(null);
}

/** The choices for rows with an id and a name (schools, instruments), by id. */
export function namedChoices<Id>(rows: readonly { id: Id; name: string }[]): FilterChoice<Id>[] {
  return rows.map((row) => ({ value: row.id, label: row.name }));
}
