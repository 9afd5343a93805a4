import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatTabsModule } from '@angular/material/tabs';
import { ListPage } from '../../core/list-page/list-page';
import { AuditLog } from '../audit-log/audit-log';
import { PersonList } from '../person-list/person-list';
import { TokenList } from '../token-list/token-list';

/**
 * The coordinator's People screen: who signs in, every API token, the audit log, and a backup
 * of the whole district to download (GET /api/backup).
 */
@Component({
  selector: 'tb-people-page',
  imports: [
    ListPage,
    MatButtonModule,
    MatIconModule,
    MatTabsModule,
    AuditLog,
    PersonList,
    TokenList,
  ],
  template: `
    <tb-list-page
      heading="People"
      lead="Who signs in to Tuttiboard, their roles and schools, the API tokens scripts use, and who changed what."
    >
      <a
        tbListActions
        mat-stroked-button
        href="/api/backup"
        download
        title="The database with every instrument photo, recording and waiting upload, as one .tar.gz that tutti restore reads"
        ><mat-icon svgIcon="download" />Download a backup</a
      >
      <mat-tab-group animationDuration="0ms" mat-stretch-tabs="false">
        <mat-tab label="People">
          <div class="tab"><tb-person-list /></div>
        </mat-tab>
        <mat-tab label="API tokens">
          <ng-template matTabContent>
            <div class="tab"><tb-token-list [everyone]="true" /></div>
          </ng-template>
        </mat-tab>
        <mat-tab label="Audit log">
          <ng-template matTabContent>
            <div class="tab"><tb-audit-log /></div>
          </ng-template>
        </mat-tab>
      </mat-tab-group>
    </tb-list-page>
  `,
  styles: `
    .tab {
      padding-top: 16px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PeoplePage {}
