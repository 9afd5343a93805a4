import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { ImportRowError } from '@shared/api/import';

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
          <th scope="col">Line</th>
          <th scope="col">Column</th>
          <th scope="col">Problem</th>
        </tr>
      </thead>
      <tbody>
        @for (error of errors(); track $index) {
          <tr>
            <td>{{ error.line || 'file' }}</td>
            <td>{{ error.column || '—' }}</td>
            <td>{{ error.message }}</td>
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
}
