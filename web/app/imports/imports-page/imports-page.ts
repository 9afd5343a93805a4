import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { MatTabsModule } from '@angular/material/tabs';
import { ListPage } from '../../core/list-page/list-page';
import { ImportHistory } from '../import-history/import-history';
import { ImportWizard } from '../import-wizard/import-wizard';

/** The Imports screen: a new roster import, and the history of past ones. */
@Component({
  selector: 'tb-imports-page',
  imports: [ListPage, MatTabsModule, ImportHistory, ImportWizard],
  template: `
    <tb-list-page
      heading="Imports"
      lead="Bring the roster in from the student information system: upload, check every row, then commit in one step."
    >
      <mat-tab-group animationDuration="0ms" mat-stretch-tabs="false">
        <mat-tab label="New import">
          <div class="tab"><tb-import-wizard (committed)="imported.set(imported() + 1)" /></div>
        </mat-tab>
        <mat-tab label="History">
          <ng-template matTabContent>
            <div class="tab"><tb-import-history [refresh]="imported()" /></div>
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
export class ImportsPage {
  protected readonly imported = signal(0);
}
