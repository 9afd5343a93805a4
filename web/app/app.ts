import {
  ChangeDetectionStrategy,
  Component,
  ViewContainerRef,
  afterNextRender,
  viewChild,
} from '@angular/core';
import { RouterOutlet } from '@angular/router';

/** The root: every page renders inside the router outlet, under the connection notices. */
@Component({
  selector: 'tb-root',
  imports: [RouterOutlet],
  template: '<ng-container #notices /><router-outlet />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {
  private readonly notices = viewChild.required('notices', { read: ViewContainerRef });

  constructor() {
    // The notices (offline, new version) load after the first render, out of the first screen's
    // bundle; the service worker keeps their chunk for the visits with no network.
    afterNextRender(() => {
      void import('./core/offline/connection-notices').then(({ ConnectionNotices }) =>
        this.notices().createComponent(ConnectionNotices),
      );
    });
  }
}
