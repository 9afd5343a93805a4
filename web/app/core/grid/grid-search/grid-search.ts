import { ChangeDetectionStrategy, Component, input, model } from '@angular/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';

/**
 * The search field at the head of a list screen's grid (`<div tbGridFilters>`); its text is the
 * grid's quick search; its `width`, when given, is the field's.
 */
@Component({
  selector: 'tb-grid-search',
  imports: [MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <mat-form-field appearance="outline" subscriptSizing="dynamic">
      <mat-label>{{ label() }}</mat-label>
      <mat-icon matPrefix svgIcon="search" />
      <input
        matInput
        type="search"
        [value]="value()"
        #searchBox
        (input)="value.set(searchBox.value)"
        [placeholder]="placeholder()"
        [attr.data-testid]="testId()"
      />
    </mat-form-field>
  `,
  styles: `
    :host {
      display: block;
    }
    mat-form-field {
      width: 100%;
    }
  `,
  host: { '[style.width]': 'width()' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class GridSearch {
  /** The field's width as a CSS length ("300px"); the whole row's when none. */
  readonly width = input<string | null>(null);
  /** The field's label, e.g. "Search students". */
  readonly label = input.required<string>();
  /** What can be searched for, e.g. "Name or student ID". */
  readonly placeholder = input('');
  /** The input's data-testid, for browser tests. */
  readonly testId = input<string | null>(null);
  /** The search text. */
  readonly value = model('');
}
