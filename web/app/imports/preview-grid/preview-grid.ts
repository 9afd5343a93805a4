import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { AgGridAngular } from 'ag-grid-angular';
import {
  CellStyleModule,
  ClientSideRowModelModule,
  TooltipModule,
  ValidationModule,
  themeQuartz,
  type ColDef,
  type Module,
} from 'ag-grid-community';
import type { PreviewRow } from '@shared/api/import';
import {
  rosterFieldLabels,
  rosterFields,
  type ColumnMapping,
  type RosterField,
} from '@shared/roster/roster-columns';

const modules: Module[] = [
  ClientSideRowModelModule,
  CellStyleModule,
  TooltipModule,
  ...(ngDevMode ? [ValidationModule] : []),
];

// The app's colours and Public Sans, which the page already has: the theme loads no font.
const theme = themeQuartz.withParams({
  fontFamily: 'Public Sans, system-ui, sans-serif',
  fontSize: 13,
  headerFontWeight: 600,
  backgroundColor: '#fffbf7',
  headerBackgroundColor: '#f6f1eb',
  headerTextColor: '#004f55',
  accentColor: '#0b6870',
  borderColor: '#e3dbd2',
  columnBorder: false,
  rowHeight: 34,
  headerHeight: 38,
  wrapperBorderRadius: 12,
});

interface GridRow {
  line: number;
  problems: string;
  /** The roster fields whose cells have an error. */
  wrong: Set<string>;
  cells: PreviewRow['cells'];
}

/** The preview's first rows as the file has them, with an error column and the wrong cells marked. */
@Component({
  selector: 'tb-preview-grid',
  imports: [AgGridAngular],
  template: `
    <ag-grid-angular
      class="grid"
      [class.short]="rows().length <= shortList"
      [domLayout]="rows().length <= shortList ? 'autoHeight' : 'normal'"
      [theme]="theme"
      [modules]="modules"
      [rowData]="rows()"
      [columnDefs]="columns()"
      [defaultColDef]="defaultColumn"
      [tooltipShowDelay]="200"
      [enableCellTextSelection]="true"
      [getRowId]="rowId"
    />
  `,
  styles: `
    :host {
      display: block;
    }
    .grid {
      height: 420px;
      width: 100%;
    }
    .grid.short {
      height: auto;
    }
    :host ::ng-deep .tb-cell-wrong {
      background: #ffdad6;
      color: #410002;
      font-weight: 600;
    }
    :host ::ng-deep .tb-problems {
      color: var(--tb-danger);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PreviewGrid {
  readonly previewRows = input.required<PreviewRow[]>();
  readonly mapping = input.required<ColumnMapping>();

  protected readonly shortList = 12;
  protected readonly theme = theme;
  protected readonly modules = modules;
  protected readonly defaultColumn: ColDef = { resizable: true, sortable: false, minWidth: 90 };
  protected readonly rowId = (params: { data: GridRow }) => String(params.data.line);

  private readonly fieldOfColumn = computed(() => {
    const byColumn = new Map<string, RosterField>();
    for (const field of rosterFields) {
      const header = this.mapping()[field];
      if (header) byColumn.set(header, field);
      byColumn.set(field, field);
    }
    return byColumn;
  });

  protected readonly rows = computed<GridRow[]>(() =>
    this.previewRows().map((row) => ({
      line: row.line,
      problems: row.errors.map((error) => error.message).join(' '),
      wrong: new Set(row.errors.flatMap((error) => this.fieldOfColumn().get(error.column) ?? [])),
      cells: row.cells,
    })),
  );

  protected readonly columns = computed<ColDef<GridRow>[]>(() => {
    const mapped = rosterFields.filter((field) => this.mapping()[field]);
    return [
      { headerName: 'Line', field: 'line', width: 80, minWidth: 70 },
      {
        headerName: 'Problems',
        field: 'problems',
        width: 280,
        tooltipField: 'problems',
        cellClass: 'tb-problems',
        valueFormatter: (params) => params.value || '—',
      },
      ...mapped.map((field): ColDef<GridRow> => ({
        colId: field,
        headerName: rosterFieldLabels[field],
        headerTooltip: `From the file's column “${this.mapping()[field]}”`,
        valueGetter: (params) => params.data?.cells[field] ?? '',
        cellClassRules: { 'tb-cell-wrong': (params) => Boolean(params.data?.wrong.has(field)) },
        width: field === 'guardianEmail' ? 240 : 140,
      })),
    ];
  });
}
