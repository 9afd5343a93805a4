import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';

/**
 * A list screen (students, instruments, schools…): the page header with its title, the line
 * under it (`lead`, or the element marked `tbListLead` when the line has markup of its own; in a
 * past school year, `pastYearLead` with the note that past years are read, not changed) and
 * the element marked `tbListActions` beside it (or, given an `addItem`, the link to the list's
 * `new` page), then the screen's own content (most often its
 * `tb-server-grid`), projected the way Material builds its chip variants on one base chip.
 */
@Component({
  selector: 'tb-list-page',
  imports: [MatButtonModule, MatIconModule, RouterLink],
  template: `
    <header class="tb-page-header">
      <div>
        <h1>{{ heading() }}</h1>
        @if (pastYearLead(); as pastLead) {
          <p data-testid="past-year-note">
            {{ pastLead }} Past years are history: read, not changed.
          </p>
        } @else if (lead()) {
          <p>{{ lead() }}</p>
        }
        <ng-content select="[tbListLead]" />
      </div>
      @if (!pastYearLead() && addItem(); as item) {
        <a mat-flat-button routerLink="new"><mat-icon svgIcon="add" />Add {{ item }}</a>
      }
      <ng-content select="[tbListActions]" />
    </header>
    <ng-content />
  `,
  styles: `
    :host {
      display: block;
    }
  `,
  host: { class: 'tb-page' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ListPage {
  /** The page's title, its `h1`. */
  readonly heading = input.required<string>();
  /** The line under the title, when it is plain words. */
  readonly lead = input('');
  /**
   * The line under the title while the page shows a past school year, which is history: read,
   * not changed, so the add link is not offered; null for the year now.
   */
  readonly pastYearLead = input<string | null>(null);
  /**
   * What the list's rows are ("student"), when the user may add one: the header then links to
   * "Add student", the list's own `new` page; null for no link.
   */
  readonly addItem = input<string | null>(null);
}
