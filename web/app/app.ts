import { ChangeDetectionStrategy, Component } from '@angular/core';
import { RouterOutlet } from '@angular/router';
import { ConnectionNotices } from './core/offline/connection-notices';

/** The root: every page renders inside the router outlet, under the connection notices. */
@Component({
  selector: 'tb-root',
  imports: [RouterOutlet, ConnectionNotices],
  template: '<tb-connection-notices /><router-outlet />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {}
