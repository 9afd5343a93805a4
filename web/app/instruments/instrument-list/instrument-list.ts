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
import { gridSource } from '../../core/grid/grid-source';
import { column, labelled } from '../../core/grid/grid-columns';
import { ListPage } from '../../core/list-page/list-page';
import { injectSchoolChoices } from '../../schools/school-choices';
import { SchoolFilter } from '../../schools/school-filter/school-filter';
import { FleetInstruments } from '../instrument-data';
import { lookColumn } from '../icon-text-cell/icon-text-cell';
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

const columns: ColDef<Instrument>[] = [
  column.field('assetTag', 'Asset tag', 110, { sort: 'asc' }),
  column.derived('instrumentId', 'Instrument', 150, (row) =>
    instrumentKindName(row.instrumentId, row.instrumentName),
  ),
  column.derived('maker', 'Maker / model', { flex: 1, minWidth: 150 }, (row) =>
    [row.maker, row.model].filter(Boolean).join(' '),
  ),
  // Searchable and on each instrument's page; the Columns menu shows it here.
  column.field('serial', 'Serial', 100, { hide: true }),
  column.formatted('condition', 'Condition', 100, labelled(conditionLabels)),
  lookColumn('status', 'Status', 115, statusLooks),
  column.field('homeSchoolCode', 'School', 85),
  column.field('location', 'Location', { flex: 1, minWidth: 100 }),
  column.formatted('purchasedOn', 'Purchased', 112, dayText),
  column.amount('purchaseCostCents', 'Cost', 85, (cents: number | null) => money(cents, true)),
];

/** The fleet: a server-paged grid with filters, saved views, and the fleet's own actions. */
@Component({
  selector: 'tb-instrument-list',
  imports: [
    ListPage,
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

  protected readonly source = gridSource(
    'instruments',
    'instrument',
    instrumentSortFields,
    columns,
    {
      emptyMessage: 'Clear the search and filters, or add instruments with a fleet CSV.',
    },
  );

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
