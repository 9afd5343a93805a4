import type { Capability } from '@shared/api/capabilities';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { MatTabsModule } from '@angular/material/tabs';
import { CurrentUser } from '../../core/auth/current-user';

/** The Reports screen: preview and send, schedules, reports sent, and the outbox, as tabs. */
@Component({
  selector: 'tb-reports-page',
  imports: [RouterOutlet, RouterLink, RouterLinkActive, MatTabsModule],
  template: `
    <div class="tb-page">
      <header class="tb-page-header">
        <div>
          <h1>Reports</h1>
          <p>
            Director reports and the district summary: preview them, send them now or on a schedule,
            and follow each message.
          </p>
        </div>
      </header>
      <nav mat-tab-nav-bar [tabPanel]="panel" mat-stretch-tabs="false" aria-label="Reports">
        @for (tab of tabs(); track tab.path) {
          <a
            mat-tab-link
            [routerLink]="tab.path"
            routerLinkActive
            #active="routerLinkActive"
            [routerLinkActiveOptions]="{ exact: tab.exact }"
            [active]="active.isActive"
          >
            {{ tab.label }}
          </a>
        }
      </nav>
      <mat-tab-nav-panel #panel>
        <div class="panel"><router-outlet /></div>
      </mat-tab-nav-panel>
    </div>
  `,
  styles: `
    .panel {
      padding-top: 20px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReportsPage {
  private readonly currentUser = inject(CurrentUser);

  protected readonly tabs = computed(() => {
    const can = (capability: Capability) => this.currentUser.can(capability);
    return [
      { path: '/reports', label: 'Preview and send', exact: true, shown: true },
      { path: '/reports/schedules', label: 'Schedules', exact: false, shown: can('reports:send') },
      { path: '/reports/sent', label: 'Reports sent', exact: false, shown: true },
      { path: '/reports/outbox', label: 'Outbox', exact: false, shown: can('outbox:read') },
    ].filter((tab) => tab.shown);
  });
}
