import './screen-kit';
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { RouterLink } from '@angular/router';
import { MatButtonModule } from '@angular/material/button';
import { PageState } from './state/page-state';

/** Any address the app does not know. */
@Component({
  selector: 'tb-not-found',
  imports: [PageState, RouterLink, MatButtonModule],
  template: `
    <div class="tb-page">
      <tb-page-state
        kind="empty"
        icon="search"
        title="There is no page here"
        message="The address may be mistyped, or the page may be for another role."
      >
        <a mat-flat-button routerLink="/">Go to the start page</a>
      </tb-page-state>
    </div>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NotFound {}
