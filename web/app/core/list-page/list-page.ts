import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';

/**
 * A list screen (students, instruments, schools…): the page header with its title, the line
 * under it (`lead`, or the element marked `tbListLead` when the line has markup of its own) and
 * the element marked `tbListActions` beside it (or, given an `addLink`, the link to a new
 * record's page), then the screen's own content (most often its
 * `tb-server-grid`), projected the way Material builds its chip variants on one base chip.
 */
@Component({
  selector: 'tb-list-page',
  imports: [MatButtonModule, MatIconModule, RouterLink],
  template: `
    <header class="tb-page-header">
      <div>
        <h1>{{ heading() }}</h1>
        @if (lead()) {
          <p>{{ lead() }}</p>
        }
        <ng-content select="[tbListLead]" />
      </div>
      @if (addLink(); as link) {
        <a mat-flat-button [routerLink]="link"><mat-icon svgIcon="add" />{{ addLabel() }}</a>
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
  /** The new record's page, when the user may add one: '/students/new'. */
  readonly addLink = input<string | null>(null);
  /** The words of the add link: "Add student". */
  readonly addLabel = input('');
}
