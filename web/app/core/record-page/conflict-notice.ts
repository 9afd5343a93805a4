import { ChangeDetectionStrategy, Component, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';

/**
 * The notice a record form shows when the API refused its save because someone else changed
 * the record first (409), with the way to read their change; the page projects its own words.
 */
@Component({
  selector: 'tb-conflict-notice',
  imports: [MatButtonModule, MatIconModule],
  template: `
    <div class="notice conflict" role="alert" data-testid="conflict">
      <mat-icon svgIcon="warning" aria-hidden="true" />
      <span><ng-content /></span>
      <button mat-stroked-button type="button" (click)="reload.emit()">
        <mat-icon svgIcon="refresh" />Reload
      </button>
    </div>
  `,
  styleUrl: './conflict-notice.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConflictNotice {
  /** Asks the page to read the record again. */
  readonly reload = output();
}
