import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  signal,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { dialogAnswer } from '../../core/confirm-dialog/dialog-answer';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { Router } from '@angular/router';
import type { ColDef } from 'ag-grid-community';
import {
  instrumentConditions,
  instrumentSortFields,
  instrumentStatuses,
  type Instrument,
  type InstrumentCondition,
  type InstrumentStatus,
} from '@shared/api/instrument';
import { instrumentFamilies } from '@shared/music/instrument-data';
import { CurrentUser } from '../../core/auth/current-user';
import { FilterSelect, choicesOf } from '../../core/grid/filter-select/filter-select';
import { GridSearch } from '../../core/grid/grid-search/grid-search';
import { ServerGrid } from '../../core/grid/server-grid';
import { injectSchoolChoices } from '../../schools/school-choices';
import { SchoolFilter } from '../../schools/school-filter/school-filter';
import { FleetInstruments } from '../instrument-data';
import { IconTextCell, type IconTextCellParams } from '../icon-text-cell/icon-text-cell';
import { FleetImportDialog } from '../fleet-import/fleet-import-dialog';
import { InstrumentFormDialog } from '../instrument-form/instrument-form-dialog';
import {
  conditionLabels,
  dayText,
  familyLabels,
  instrumentKindName,
  money,
  statusLooks,
} from '../instrument-labels';
import { InstrumentViewBar } from './instrument-view-bar';
import type { InstrumentViewFilters } from '../instrument-views';

/** The fleet: a server-paged grid with filters, saved views, and the fleet's own actions. */
@Component({
  selector: 'tb-instrument-list',
  imports: [
    ServerGrid,
    GridSearch,
    FilterSelect,
    SchoolFilter,
    InstrumentViewBar,
    MatButtonModule,
    MatIconModule,
    MatMenuModule,
  ],
  templateUrl: './instrument-list.html',
  styleUrl: './instrument-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstrumentList {
  private readonly router = inject(Router);
  private readonly dialog = inject(MatDialog);
  private readonly grid = viewChild(ServerGrid);
  private readonly instruments = inject(FleetInstruments);

  protected readonly canWrite = inject(CurrentUser).can('fleet:write');
  protected readonly schools = injectSchoolChoices();
  protected readonly statusChoices = choicesOf(
    instrumentStatuses,
    (status) => statusLooks[status].label,
  );
  protected readonly conditionChoices = choicesOf(
    instrumentConditions,
    (value) => conditionLabels[value],
  );
  protected readonly familyChoices = choicesOf(
    instrumentFamilies,
    (family) => familyLabels[family],
  );

  protected readonly search = signal('');
  protected readonly status = signal<InstrumentStatus | null>(null);
  protected readonly condition = signal<InstrumentCondition | null>(null);
  protected readonly family = signal<string | null>(null);
  protected readonly homeSchoolId = signal<number | null>(null);
  protected readonly filters = computed(() => ({
    status: this.status(),
    condition: this.condition(),
    family: this.family(),
    homeSchoolId: this.homeSchoolId(),
  }));
  /** The filters as a saved view keeps them. */
  protected readonly viewFilters = computed<InstrumentViewFilters>(() => ({
    q: this.search() || undefined,
    status: this.status() ?? undefined,
    condition: this.condition() ?? undefined,
    family: this.family() ?? undefined,
    homeSchoolId: this.homeSchoolId() ?? undefined,
  }));
  protected readonly filtered = computed(() =>
    Object.values(this.viewFilters()).some((value) => value !== undefined),
  );

  protected readonly sortFields = instrumentSortFields;
  protected readonly columns: ColDef<Instrument>[] = [
    { field: 'assetTag', headerName: 'Asset tag', width: 110, sort: 'asc' },
    {
      colId: 'instrumentId',
      headerName: 'Instrument',
      width: 150,
      valueGetter: ({ data }) =>
        data ? instrumentKindName(data.instrumentId, data.instrumentName) : '',
    },
    {
      colId: 'maker',
      headerName: 'Maker / model',
      flex: 1,
      minWidth: 150,
      valueGetter: ({ data }) => (data ? [data.maker, data.model].filter(Boolean).join(' ') : ''),
    },
    // Searchable and on each instrument's page; the Columns menu shows it here.
    { field: 'serial', headerName: 'Serial', width: 100, hide: true },
    {
      field: 'condition',
      headerName: 'Condition',
      width: 100,
      valueFormatter: ({ value }) => conditionLabels[value as InstrumentCondition] ?? '',
    },
    {
      field: 'status',
      headerName: 'Status',
      width: 115,
      valueFormatter: ({ value }) => statusLooks[value as InstrumentStatus]?.label ?? '',
      cellRenderer: IconTextCell,
      cellRendererParams: {
        iconOf: (row) => statusLooks[row.status],
      } satisfies IconTextCellParams<Instrument>,
    },
    { field: 'homeSchoolCode', headerName: 'School', width: 85 },
    { field: 'location', headerName: 'Location', flex: 1, minWidth: 100 },
    {
      field: 'purchasedOn',
      headerName: 'Purchased',
      width: 112,
      valueFormatter: ({ value }) => dayText(value as string | null),
    },
    {
      field: 'purchaseCostCents',
      headerName: 'Cost',
      width: 85,
      type: 'rightAligned',
      valueFormatter: ({ value }) => money(value as number | null, true),
    },
  ];

  protected applyView(filters: InstrumentViewFilters): void {
    this.search.set(filters.q ?? '');
    this.status.set((filters.status as InstrumentStatus | undefined) ?? null);
    this.condition.set((filters.condition as InstrumentCondition | undefined) ?? null);
    this.family.set(filters.family ?? null);
    this.homeSchoolId.set(filters.homeSchoolId ?? null);
  }

  protected clearFilters(): void {
    this.applyView({});
  }

  protected open(instrument: Instrument): void {
    void this.router.navigate(['/instruments', instrument.id]);
  }

  protected labelsUrl(schoolId: number): string {
    return this.instruments.labelsUrl(schoolId);
  }

  protected async addInstrument(): Promise<void> {
    const saved = await dialogAnswer<Instrument>(this.dialog, InstrumentFormDialog, {
      data: { schools: this.schools() },
      width: '640px',
      ariaLabelledBy: 'instrument-form-title',
    });
    if (saved) void this.router.navigate(['/instruments', saved.id]);
  }

  protected async importFleet(): Promise<void> {
    const committed = await dialogAnswer<boolean>(this.dialog, FleetImportDialog, {
      width: '720px',
    });
    if (committed) this.grid()?.refresh();
  }
}
