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
import {
  IconTextCell,
  type IconTextCellParams,
} from '../../instruments/icon-text-cell/icon-text-cell';
import { dayText, money } from '../../instruments/instrument-labels';
import { repairDialog } from '../repair-dialog/repair-dialog';
import { repairStatusLooks } from '../repair-looks';
import { IconButton } from '../../core/icon-button/icon-button';

type Showing = 'open' | 'all' | RepairStatus;

/** Repair tickets: open and past, with new tickets and status changes for technicians. */
@Component({
  selector: 'tb-repair-list',
  imports: [
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
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
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
  protected readonly sortFields = repairSortFields;
  protected readonly columns: ColDef<Repair>[] = [
    { field: 'assetTag', headerName: 'Asset tag', width: 115 },
    { field: 'instrumentName', headerName: 'Instrument', width: 135 },
    { field: 'homeSchoolCode', headerName: 'School', width: 85 },
    { field: 'problem', headerName: 'Problem', flex: 2, minWidth: 160 },
    {
      colId: 'vendor',
      headerName: 'Done by',
      width: 130,
      valueGetter: ({ data }) =>
        data ? (data.inHouse ? 'In-house' : (data.vendor ?? 'Vendor')) : '',
    },
    {
      field: 'status',
      headerName: 'Status',
      width: 150,
      valueFormatter: ({ value }) => repairStatusLooks[value as RepairStatus]?.label ?? '',
      cellRenderer: IconTextCell,
      cellRendererParams: {
        iconOf: (repair) => repairStatusLooks[repair.status],
      } satisfies IconTextCellParams<Repair>,
    },
    {
      field: 'estimateCents',
      headerName: 'Estimate',
      width: 95,
      type: 'rightAligned',
      valueFormatter: ({ value }) => money(value as number | null),
    },
    {
      field: 'finalCostCents',
      headerName: 'Final cost',
      width: 100,
      type: 'rightAligned',
      valueFormatter: ({ value }) => money(value as number | null),
    },
    {
      field: 'sentOn',
      headerName: 'Sent',
      width: 110,
      valueFormatter: ({ value }) => dayText(value as string | null),
    },
    {
      field: 'returnedOn',
      headerName: 'Returned',
      width: 110,
      valueFormatter: ({ value }) => dayText(value as string | null),
    },
    {
      field: 'createdAt',
      headerName: 'Opened',
      width: 110,
      sort: 'desc',
      hide: true,
      valueFormatter: ({ value }) => dayText(value as string),
    },
  ];

  protected async openTicket(repair: Repair | null): Promise<void> {
    const saved = await repairDialog(this.dialog, { repair, editable: this.canWrite });
    if (saved) this.grid()?.refresh();
  }
}
