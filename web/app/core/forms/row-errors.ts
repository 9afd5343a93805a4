import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { ImportRowError } from '@shared/api/import';

/** The table's columns: each one's heading and its words for an error. */
const columns: readonly { heading: string; text: (error: ImportRowError) => string }[] = [
  { heading: 'Line', text: (error) => (error.line ? String(error.line) : 'file') },
  { heading: 'Column', text: (error) => error.column || '—' },
  { heading: 'Problem', text: (error) => error.message },
];

/**
 * The table of a file's errors, one row each: its line (or "file" for the file as a whole), its
 * column, and what is wrong. Long lists scroll inside the table, under its fixed head. Used by
 * every import of a CSV file (the roster, the fleet).
 */
@Component({
  selector: 'tb-row-errors',
  template: `
    <table>
      <thead>
        <tr>
          @for (column of columns; track column.heading) {
            <th scope="col">{{ column.heading }}</th>
          }
        </tr>
      </thead>
      <tbody>
        @for (error of errors(); track $index) {
          <tr>
            @for (column of columns; track column.heading) {
              <td>{{ column.text(error) }}</td>
            }
          </tr>
        }
      </tbody>
    </table>
  `,
  styleUrl: './row-errors.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RowErrors {
  /** The errors to list, in the file's order. */
  readonly errors = input.required<readonly ImportRowError[]>();

  protected readonly columns = columns;
}
