import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import type { ColDef } from 'ag-grid-community';
import {
  repairCaution,
  repairSortFields,
  repairStatuses,
  type Repair,
  type RepairStatus,
} from '@shared/api/repair';
import { CurrentUser } from '../../core/auth/current-user';
import { ServerGrid } from '../../core/grid/server-grid';
import { gridSource } from '../../core/grid/grid-source';
import { column } from '../../core/grid/grid-columns';
import { ListPage } from '../../core/list-page/list-page';
import { lookColumn } from '../../instruments/icon-text-cell/icon-text-cell';
import { dayText, money } from '../../instruments/instrument-labels';
import { repairDialog } from '../repair-dialog/repair-dialog';
import { repairStatusLooks } from '../repair-looks';
import { IconButton } from '../../core/icon-button/icon-button';

const columns: ColDef<Repair>[] = [
  column.field('assetTag', 'Asset tag', 115),
  column.field('instrumentName', 'Instrument', 135),
  column.field('homeSchoolCode', 'School', 85),
  column.field('problem', 'Problem', { flex: 2, minWidth: 160 }),
  column.derived('vendor', 'Done by', 130, (row) =>
    row.inHouse ? 'In-house' : (row.vendor ?? 'Vendor'),
  ),
  lookColumn('status', 'Status', 150, repairStatusLooks),
  column.amount('estimateCents', 'Estimate', 95, (cents: number | null) => money(cents)),
  column.amount('finalCostCents', 'Final cost', 100, (cents: number | null) => money(cents)),
  column.formatted('sentOn', 'Sent', 110, dayText),
  column.formatted('returnedOn', 'Returned', 110, dayText),
  column.formatted('createdAt', 'Opened', 110, dayText, { sort: 'desc', hide: true }),
];

type Showing = 'open' | 'all' | RepairStatus;

/** Repair tickets: open and past, with new tickets and status changes for technicians. */
@Component({
  selector: 'tb-repair-list',
  imports: [
    ListPage,
    IconButton,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatSelectModule,
    ServerGrid,
  ],
  templateUrl: './repair-list.html',
  styles: `
    .caution {
      display: flex;
      align-items: center;
      gap: 8px;
      margin: -8px 0 16px;
      padding: 10px 14px;
      border-left: 4px solid var(--tb-brass);
      background: #fbf3e4;
      border-radius: 6px;
      mat-icon {
        flex: none;
        fill: var(--tb-brass);
      }
    }
    .filters {
      align-items: center;
    }
    .showing {
      width: 200px;
    }
    .instrument-filter {
      display: inline-flex;
      align-items: center;
      gap: 4px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RepairList {
  private readonly dialog = inject(MatDialog);
  private readonly grid = viewChild(ServerGrid);

  /** `?instrumentId=` from an instrument's page. */
  readonly instrumentId = input<string | undefined>(undefined);

  protected readonly canWrite = inject(CurrentUser).can('repairs:write');
  protected readonly caution = repairCaution;
  protected readonly statuses = repairStatuses;
  protected readonly looks = repairStatusLooks;
  protected readonly showing = signal<Showing>('open');
  protected readonly instrumentFilter = linkedSignal<number | null>(() => {
    const id = Number(this.instrumentId());
    return Number.isInteger(id) && id > 0 ? id : null;
  });
  protected readonly filters = computed(() => {
    const showing = this.showing();
    return {
      open: showing === 'open' ? 'true' : null,
      status: showing !== 'open' && showing !== 'all' ? showing : null,
      instrumentId: this.instrumentFilter(),
    };
  });
  protected readonly source = gridSource('repairs', 'ticket', repairSortFields, columns, {
    label: 'Repair tickets',
    emptyTitle: 'No repair tickets here',
    emptyMessage: 'Show every ticket, or open one when an instrument needs work.',
  });

  protected async openTicket(repair: Repair | null): Promise<void> {
    const saved = await repairDialog(this.dialog, { repair, editable: this.canWrite });
    if (saved) this.grid()?.refresh();
  }
}
