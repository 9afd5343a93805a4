import { HttpClient } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  computed,
  effect,
  inject,
  input,
  output,
  signal,
  untracked,
} from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { BreakpointObserver } from '@angular/cdk/layout';
import { MatBottomSheet } from '@angular/material/bottom-sheet';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatMenuModule } from '@angular/material/menu';
import { AgGridAngular } from 'ag-grid-angular';
import type {
  CellKeyDownEvent,
  FullWidthCellKeyDownEvent,
  ColDef,
  ColumnState,
  GridApi,
  GridReadyEvent,
  IDatasource,
  RowClickedEvent,
} from 'ag-grid-community';
import * as z from 'zod';
import { listResponseSchema } from '@shared/api/list';
import { errorMessage } from '../parse';
import { map, firstValueFrom } from 'rxjs';
import { columnCsv } from './column-csv';
import { GridExport } from './grid-export';
import { GridLayouts } from './grid-layouts';
import { columnStateOf, layoutOf } from './grid-layout';
import { rowDetail } from './row-detail/row-detail';
import { RowDetailSheet, type RowDetailSheetData } from './row-detail/row-detail-sheet';
import { serverGridModules } from './grid-modules';
import type { GridSource } from './grid-source';
import { listParameters, nextCursor, sortParameter, type GridFilters } from './grid-query';
import { gridHeaderHeight, gridRowHeight, gridTheme } from './grid-theme';
import { formatCount } from '../format/formats';
import {
  compactQuery,
  fittingColumnIds,
  keyColumnIds,
  mediumQuery,
  type WindowClass,
} from './grid-fit';
import { createWrite } from '../state/write';

const pageSchema = listResponseSchema(z.record(z.string(), z.unknown()));

/** The rows of one request; the list routes answer pages of this size as the user scrolls. */
export const gridPageSize = 100;

const searchPause = 250;
const emptyHeight = 340;
const layoutSavePause = 800;

interface ColumnChoice {
  colId: string;
  header: string;
}

/**
 * A grid over one of the API's list routes: pages of 100 rows fetched as the user scrolls, the
 * sort and filters applied by the server, a row count, designed loading and empty states, a
 * column chooser, the layout remembered per user, and "Export CSV" of the current view.
 */
@Component({
  selector: 'tb-server-grid',
  imports: [AgGridAngular, MatButtonModule, MatIconModule, MatProgressBarModule, MatMenuModule],
  templateUrl: './server-grid.html',
  styleUrl: './server-grid.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ServerGrid<Row extends { id: number } = { id: number }> {
  private readonly write = createWrite();
  private readonly http = inject(HttpClient);
  private readonly layouts = inject(GridLayouts);
  private readonly exporter = inject(GridExport);
  private readonly bottomSheet = inject(MatBottomSheet);

  /** What the grid lists: its route, layout name, rows' name, columns and words (`gridSource()`). */
  readonly source = input.required<GridSource<Row>>();
  /** Extra query parameters: the screen's field filters. */
  readonly filters = input<GridFilters>({});
  /** The search box's text, sent as `q`. */
  readonly quickSearch = input('');
  /** The plural, when it is not the name plus s. */
  readonly itemNamePlural = input('');
  /** The empty state's title when it changes with the screen's view (else the source's). */
  readonly emptyTitle = input('');
  /** The empty state's line when it changes with the screen's view (else the source's). */
  readonly emptyMessage = input('');
  /** The words of the phone's detail sheet button that opens a row (else "Open the <item>"). */
  readonly openLabel = input('');

  /** A row was clicked, or Enter was pressed on it. */
  readonly rowOpened = output<Row>();

  protected readonly theme = gridTheme;
  protected readonly modules = serverGridModules;
  protected readonly pageSize = gridPageSize;
  protected readonly total = signal<number | null>(null);
  protected readonly requests = signal(0);
  protected readonly failure = signal<string | null>(null);
  protected readonly exportStatus = signal('');
  protected readonly exporting = signal(false);
  protected readonly choices = signal<ColumnChoice[]>([]);
  protected readonly visibleColumns = signal<string[]>([]);

  protected readonly columnDefs = computed(() => {
    const sortable = new Set(this.source().sortFields);
    return this.source().columns.map((column) => ({
      ...column,
      sortable: sortable.has(column.colId ?? column.field ?? ''),
    }));
  });
  // The server always sorts by something, so a header toggles between the two directions.
  protected readonly defaultColDef: ColDef<Row> = {
    resizable: true,
    minWidth: 70,
    sortingOrder: ['asc', 'desc'],
  };
  /** What the rows are, in the plural: 'students'. */
  protected readonly pluralName = computed(
    () => this.itemNamePlural() || `${this.source().itemName}s`,
  );
  protected readonly countText = computed(() => {
    const total = this.total();
    return total === null ? 'Counting…' : this.rowsText(total);
  });
  /** A short list gets a grid just tall enough for it; a long one fills the page. */
  protected readonly fittedHeight = computed(() => {
    const total = this.total();
    if (total === 0) return emptyHeight;
    if (total === null || total > 12) return null;
    // Room below the rows for a horizontal scroll bar on narrow screens.
    return gridHeaderHeight + total * gridRowHeight + 18;
  });
  protected readonly emptyTitleText = computed(() => this.emptyTitle() || this.source().emptyTitle);
  protected readonly emptyMessageText = computed(
    () => this.emptyMessage() || this.source().emptyMessage,
  );
  protected readonly firstLoad = computed(() => this.total() === null && this.requests() > 0);

  private api: GridApi<Row> | null = null;
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  private readonly windowClass = toSignal(
    inject(BreakpointObserver)
      .observe([compactQuery, mediumQuery])
      .pipe(
        map((state): WindowClass =>
          state.breakpoints[compactQuery]
            ? 'compact'
            : state.breakpoints[mediumQuery]
              ? 'medium'
              : 'expanded',
        ),
      ),
    { initialValue: 'expanded' as WindowClass },
  );
  /** The user's own column state while a narrow window shows only some columns. */
  private wideState: ColumnState[] | null = null;
  private generation = 0;
  private restoring = true;
  private lastSavedLayout = '';
  private searchTimer: ReturnType<typeof setTimeout> | undefined;
  private saveTimer: ReturnType<typeof setTimeout> | undefined;

  constructor() {
    effect(() => {
      this.source();
      this.filters();
      this.quickSearch();
      untracked(() => this.scheduleRefresh());
    });
    effect(() => {
      const windowClass = this.windowClass();
      untracked(() => this.fitWidth(windowClass));
    });
    inject(DestroyRef).onDestroy(() => {
      clearTimeout(this.searchTimer);
      clearTimeout(this.saveTimer);
      this.generation++;
    });
  }

  /** "1 student", "1,204 students": a count of rows in the source's words. */
  private rowsText(count: number): string {
    return `${formatCount(count)} ${count === 1 ? this.source().itemName : this.pluralName()}`;
  }

  protected getRowId = (params: { data: Row }) => String(params.data.id);

  protected async onGridReady(event: GridReadyEvent<Row>): Promise<void> {
    this.api = event.api;
    this.refreshChoices();
    // The saved layout is applied once the grid is ready; one that cannot be read is null.
    const layout = await firstValueFrom(this.layouts.load(this.source().gridId));
    if (layout && this.api) {
      const known = new Set(this.choices().map((choice) => choice.colId));
      const sortable = new Set(this.source().sortFields);
      this.api.applyColumnState({
        state: columnStateOf(layout, known, sortable),
        applyOrder: true,
      });
      this.lastSavedLayout = JSON.stringify(layoutOf(this.api.getColumnState()));
      this.refreshChoices();
    }
    this.restoring = false;
    this.fitWidth(this.windowClass());
    this.refresh();
  }

  protected onRowClicked(event: RowClickedEvent<Row>): void {
    if (event.data) this.activate(event.data);
  }

  protected onCellKeyDown(event: CellKeyDownEvent<Row> | FullWidthCellKeyDownEvent<Row>): void {
    const key = (event.event as KeyboardEvent | undefined)?.key;
    if (key === 'Enter' && event.data) this.activate(event.data);
  }

  /**
   * A tap or Enter on a row: on a wide screen it opens the row; on a phone or a tablet held
   * upright, where only some columns fit, it first shows the rest of the row in a bottom sheet,
   * with a button to open it.
   */
  private activate(row: Row): void {
    if (this.windowClass() === 'expanded' || !this.wideState || !this.api) {
      this.rowOpened.emit(row);
      return;
    }
    const columns = (this.api.getColumns() ?? []).map((column) => column.getColDef());
    const detail = rowDetail(columns, this.visibleColumns(), row);
    if (detail.fields.length === 0) {
      this.rowOpened.emit(row);
      return;
    }
    const data: RowDetailSheetData = {
      itemName: this.source().itemName,
      detail,
      openLabel: this.openLabel() || `Open the ${this.source().itemName}`,
    };
    this.bottomSheet
      .open<RowDetailSheet, RowDetailSheetData, boolean>(RowDetailSheet, {
        data,
        ariaLabel: `${this.source().itemName}: ${detail.title}`,
      })
      .afterDismissed()
      // The sheet's dismissal is an event for later; the grid goes on meanwhile.
      .subscribe((open) => {
        if (open) this.rowOpened.emit(row);
      });
  }

  /** Any change of columns or sort: remember the layout a moment later. */
  protected onLayoutChanged(): void {
    this.refreshChoices();
    // A phone's key-column view is not the user's layout: it is never saved over it.
    if (this.restoring || this.wideState) return;
    clearTimeout(this.saveTimer);
    this.saveTimer = setTimeout(() => this.saveLayout(), layoutSavePause);
  }

  /**
   * On a phone's width, shows only the key columns; on a medium window, the key columns and the
   * others that fit at their widths; either way fitted to the width, the rest in the row's detail
   * sheet and the column chooser. Back on a wide window, the user's own layout returns.
   */
  private fitWidth(windowClass: WindowClass): void {
    const api = this.api;
    if (!api || this.restoring) return;
    if (this.wideState) {
      const own = this.wideState;
      this.wideState = null;
      api.applyColumnState({ state: own, applyOrder: true });
    }
    if (windowClass !== 'expanded') {
      const state = api.getColumnState();
      const shown = state.filter((column) => !column.hide).map((column) => column.colId);
      // The grid's box less its border; before layout (no width yet) every column stays.
      const available = this.host.nativeElement.clientWidth - 2;
      const keep = new Set(
        windowClass === 'compact'
          ? keyColumnIds(this.source().columns, shown)
          : available > 0
            ? fittingColumnIds(this.source().columns, state, available)
            : shown,
      );
      this.wideState = state;
      api.setColumnsVisible(
        shown.filter((colId) => !keep.has(colId)),
        false,
      );
      api.sizeColumnsToFit();
    }
    this.refreshChoices();
  }

  protected toggleColumn(colId: string): void {
    if (!this.api) return;
    const shown = this.visibleColumns().includes(colId);
    // An empty grid helps nobody: the last visible column stays.
    if (shown && this.visibleColumns().length === 1) return;
    this.api.setColumnsVisible([colId], !shown);
    this.onLayoutChanged();
  }

  /** Downloads every row of the current search, filters and sort, in the visible columns. */
  protected async exportCsv(): Promise<void> {
    if (!this.api || this.exporting()) return;
    this.exporting.set(true);
    this.exportStatus.set('Preparing the export…');
    try {
      const columns = this.api
        .getAllDisplayedColumns()
        .map((column) => columnCsv<Row>(column.getColDef()));
      const date = new Date().toISOString().slice(0, 10);
      const count = await this.exporter.download(
        {
          endpoint: this.source().endpoint,
          quickSearch: this.quickSearch(),
          filters: this.filters(),
          sort: sortParameter(this.sortModel()),
          columns: columns as never,
          progress: (fetched, total) =>
            this.exportStatus.set(`Exporting ${formatCount(fetched)} of ${formatCount(total)}…`),
        },
        `${this.source().gridId}-${date}.csv`,
      );
      this.exportStatus.set(`Exported ${this.rowsText(count)}.`);
    } catch (error) {
      this.exportStatus.set(errorMessage(error, 'The export failed. Try again.'));
    } finally {
      this.exporting.set(false);
    }
  }

  /** Fetches the rows again from the top, for instance after a row was changed elsewhere. */
  refresh(): void {
    if (!this.api || this.restoring) return;
    // The count and the rows shown stay until the new answer arrives, so typing does not flicker.
    this.failure.set(null);
    this.api.setGridOption('datasource', this.datasource());
  }

  private scheduleRefresh(): void {
    clearTimeout(this.searchTimer);
    this.searchTimer = setTimeout(() => this.refresh(), searchPause);
  }

  private sortModel() {
    return (this.api?.getColumnState() ?? [])
      .filter((column) => column.sort)
      .map((column) => ({ colId: column.colId, sort: column.sort! }));
  }

  private datasource(): IDatasource {
    const generation = ++this.generation;
    // Where a route answers a cursor for the page after (RFC 8288 Link, rel="next"), the next
    // block of the same sort starts from it (keyset paging: as fast deep down as at the top).
    const cursors = new Map<string, string>();
    return {
      getRows: (params) => {
        const sort = sortParameter(params.sortModel);
        const query = listParameters({
          quickSearch: this.quickSearch(),
          filters: this.filters(),
          sort,
          offset: params.startRow,
          limit: params.endRow - params.startRow,
        });
        // A cursor serves only the request it was made for: same search, filters, sort and size.
        const { offset: _offset, ...rest } = query;
        const cursorKey = (startRow: number) => `${JSON.stringify(rest)}|${startRow}`;
        const after = cursors.get(cursorKey(params.startRow));
        if (after) query['after'] = after;
        this.requests.update((count) => count + 1);
        this.http
          .get(this.source().endpoint, { params: query, observe: 'response' })
          .pipe(
            map((response) => ({
              page: pageSchema.parse(response.body),
              next: nextCursor(response.headers.get('link')),
            })),
          )
          // AG Grid asks for each block of rows through its datasource callback, and is answered in it.
          .subscribe({
            next: ({ page, next }) => {
              this.requests.update((count) => count - 1);
              if (generation !== this.generation) return;
              if (next) cursors.set(cursorKey(params.startRow + page.rows.length), next);
              this.total.set(page.total);
              params.successCallback(page.rows, page.total);
            },
            error: (error: unknown) => {
              this.requests.update((count) => count - 1);
              if (generation !== this.generation) return;
              this.failure.set(errorMessage(error, 'The list could not be loaded.'));
              params.failCallback();
            },
          });
      },
    };
  }

  private refreshChoices(): void {
    const columns = this.api?.getColumns() ?? [];
    this.choices.set(
      columns.map((column) => ({
        colId: column.getColId(),
        header: column.getColDef().headerName ?? column.getColId(),
      })),
    );
    this.visibleColumns.set(
      columns.filter((column) => column.isVisible()).map((column) => column.getColId()),
    );
  }

  private saveLayout(): void {
    // A narrow window's columns are not the user's layout (see fitWidth).
    if (!this.api || this.wideState) return;
    const layout = layoutOf(this.api.getColumnState());
    const text = JSON.stringify(layout);
    if (text === this.lastSavedLayout) return;
    this.lastSavedLayout = text;
    // A layout that cannot be saved is not worth interrupting the user for.
    this.write.send(this.layouts.save(this.source().gridId, layout), {
      error: () => (this.lastSavedLayout = ''),
    });
  }
}
