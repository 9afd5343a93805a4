import {
  ChangeDetectionStrategy,
  Component,
  booleanAttribute,
  computed,
  input,
} from '@angular/core';
import type { Resource } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { errorMessage } from '../parse';
import { PageState } from '../state/page-state';

/**
 * A record's own page (a school, an ensemble, a student, an instrument…): the link back to its
 * list, then the record's loading or error state, or the page's own content projected into it
 * once the record is there. A new record's page passes no `record` and shows its content at once.
 * With a `heading`, the shell draws the page header too, the element marked `recordLead` as the
 * line under the title.
 */
@Component({
  selector: 'tb-record-page',
  imports: [RouterLink, MatButtonModule, MatIconModule, PageState],
  template: `
    <div class="tb-page">
      <a class="back" [routerLink]="backLink()"
        ><mat-icon svgIcon="arrow_back" aria-hidden="true" />{{ backLabel() }}</a
      >
      @switch (state()) {
        @case ('loading') {
          <tb-page-state kind="loading" [title]="'Loading the ' + noun() + '…'" />
        }
        @case ('error') {
          <tb-page-state
            kind="error"
            [title]="'The ' + noun() + ' could not be opened'"
            [message]="message()"
          >
            <a mat-stroked-button [routerLink]="backLink()">{{
              backText() ?? 'Back to ' + backLabel().toLowerCase()
            }}</a>
          </tb-page-state>
        }
        @case ('ready') {
          @if (heading() !== null) {
            <header class="tb-page-header">
              <div>
                <h1>{{ heading() }}</h1>
                <p><ng-content select="[recordLead]" /></p>
              </div>
            </header>
          }
          <ng-content />
        }
      }
    </div>
  `,
  styleUrl: './record-page.scss',
  host: { '[class.tight]': 'tight()' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RecordPage {
  /** The list the back link returns to, and its name on screen ("Schools"). */
  readonly backLink = input.required<string>();
  readonly backLabel = input.required<string>();
  /** The error state's button, when not "Back to" the list's name ("Back to counts"). */
  readonly backText = input<string | null>(null);
  /** What the record is called in the loading and error states ("school"). */
  readonly noun = input.required<string>();
  /** The page's title ("Add a school", the school's name); none when the page draws its own. */
  readonly heading = input<string | null>(null);
  /** An editor's page: a tighter back link, closer to the editor's own title. */
  readonly tight = input(false, { transform: booleanAttribute });
  /** The record's resource; none for a record not made yet. */
  readonly record = input<Resource<unknown> | null>(null);

  protected readonly state = computed(() => {
    const record = this.record();
    if (!record || record.hasValue()) return 'ready';
    return record.error() ? 'error' : 'loading';
  });
  protected readonly message = computed(() =>
    errorMessage(this.record()?.error(), `The ${this.noun()} could not be loaded.`),
  );
}
