import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Resource } from '@angular/core';
import { errorMessage } from '../parse';
import { PageState } from './page-state';

/**
 * What a page shows in place of a resource's content until it has a value: its loading state,
 * or its error with the API's message (the shared error body) and the buttons projected into
 * it. Shows nothing once the value is there; the page narrows with `hasValue()` around it.
 */
@Component({
  selector: 'tb-resource-state',
  imports: [PageState],
  template: `
    @if (resource().error(); as error) {
      <tb-page-state kind="error" [title]="failed()" [message]="message()">
        <ng-content />
      </tb-page-state>
    } @else if (!resource().hasValue()) {
      <tb-page-state kind="loading" [title]="loading()" />
    }
  `,
  // The page's layout sees the state itself, as if the page had written it in place.
  styles: ':host { display: contents; }',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResourceState {
  readonly resource = input.required<Resource<unknown>>();
  /** The loading state's title ("Loading the fees…"). */
  readonly loading = input.required<string>();
  /** The error state's title ("The fees could not be loaded"). */
  readonly failed = input.required<string>();
  /** The message when the error carries none of its own. */
  readonly fallback = input<string>('Something went wrong. Try again.');

  protected readonly message = computed(() =>
    errorMessage(this.resource().error(), this.fallback()),
  );
}
