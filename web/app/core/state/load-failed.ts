import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { PageState } from './page-state';

/**
 * The error state of a read the user can ask for again: the page state with its title and
 * message, and a "Try again" button that emits `retry` (the page reloads its resource).
 */
@Component({
  selector: 'tb-load-failed',
  imports: [MatButtonModule, MatIconModule, PageState],
  template: `
    <tb-page-state kind="error" [title]="title()" [message]="message()">
      <button mat-stroked-button type="button" (click)="retry.emit()">
        <mat-icon svgIcon="refresh" />Try again
      </button>
    </tb-page-state>
  `,
  // The page's layout sees the state itself, as if the page had written it in place.
  styles: ':host { display: contents; }',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LoadFailed {
  /** The state's title ("The people could not be loaded"). */
  readonly title = input.required<string>();
  readonly message = input('Check your connection, then try again.');
  /** The user asked to read it again. */
  readonly retry = output();
}
