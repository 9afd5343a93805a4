import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { AgGridAngular } from 'ag-grid-angular';
import type {
  CellClickedEvent,
  CellFocusedEvent,
  CellKeyDownEvent,
  ColDef,
  FullWidthCellKeyDownEvent,
  GetRowIdParams,
  GridReadyEvent,
} from 'ag-grid-community';
import { gridTheme } from '../../core/grid/grid-theme';
import type { EntryRow } from '../entry-columns';
import { entryGridModules } from './entry-grid-modules';

/**
 * The keyboard entry grid itself: AG Grid with the entry's modules and theme. A component of
 * its own so the pass-off screen loads the grid library in a `@defer` block (Angular's deferrable
 * views) only where the keyboard grid is shown, never on the touch entry.
 */
@Component({
  selector: 'tb-entry-grid',
  imports: [AgGridAngular],
  template: `
    <ag-grid-angular
      class="grid"
      [attr.aria-labelledby]="labelledBy()"
      data-testid="pass-off-grid"
      [modules]="modules"
      [theme]="theme"
      [rowData]="rows()"
      [columnDefs]="columns()"
      [defaultColDef]="{ sortable: false, suppressMovable: true, resizable: false }"
      [getRowId]="rowId"
      [rowHeight]="50"
      [tooltipShowDelay]="400"
      [suppressCellFocus]="false"
      (gridReady)="gridReady.emit($event)"
      (cellFocused)="cellFocused.emit($event)"
      (cellKeyDown)="cellKeyDown.emit($event)"
      (cellClicked)="cellClicked.emit($event)"
    />
  `,
  styles: `
    :host {
      display: block;
    }
    .grid {
      display: block;
      height: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EntryGrid {
  readonly rows = input.required<EntryRow[]>();
  readonly columns = input.required<ColDef<EntryRow>[]>();
  readonly labelledBy = input<string>();
  readonly gridReady = output<GridReadyEvent<EntryRow>>();
  readonly cellFocused = output<CellFocusedEvent<EntryRow>>();
  readonly cellKeyDown = output<CellKeyDownEvent<EntryRow> | FullWidthCellKeyDownEvent<EntryRow>>();
  readonly cellClicked = output<CellClickedEvent<EntryRow>>();

  protected readonly modules = entryGridModules;
  protected readonly theme = gridTheme;
  protected readonly rowId = (params: GetRowIdParams<EntryRow>) => String(params.data.studentId);
}
