import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { ICellRendererAngularComp } from 'ag-grid-angular';
import type { ICellRendererParams } from 'ag-grid-community';
import type { ColDef, ColDefField } from 'ag-grid-community';
import { column, type ColumnExtras } from '../../core/grid/grid-columns';

/** The icon a cell shows before its text, and the icon's tone. */
export interface CellIcon {
  icon: string;
  tone: 'ok' | 'info' | 'warn' | 'danger' | 'muted';
}

/** What a column gives the cell: the icon for a row, or null for text alone. */
export interface IconTextCellParams<Row> {
  iconOf: (row: Row) => CellIcon | null;
}

/**
 * A grid cell with an icon and words (a status, a signed agreement): the words carry the meaning,
 * so the cell never relies on colour alone. The text is the column's formatted value.
 */
@Component({
  selector: 'tb-icon-text-cell',
  imports: [MatIconModule],
  template: `
    @if (icon(); as look) {
      <mat-icon [svgIcon]="look.icon" [class]="look.tone" aria-hidden="true" />
    }
    <span>{{ text() }}</span>
  `,
  styles: `
    :host {
      display: inline-flex;
      align-items: center;
      gap: 6px;
      line-height: 1.2;
      vertical-align: middle;
      max-width: 100%;
    }
    span {
      overflow: hidden;
      text-overflow: ellipsis;
    }
    mat-icon {
      display: block;
      width: 18px;
      height: 18px;
      flex: none;
    }
    .ok {
      fill: var(--tb-ok);
    }
    .info {
      fill: var(--tb-teal);
    }
    .warn {
      fill: var(--tb-warn);
    }
    .danger {
      fill: var(--tb-danger);
    }
    .muted {
      fill: var(--tb-text-muted);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class IconTextCell<Row = unknown> implements ICellRendererAngularComp {
  protected readonly icon = signal<CellIcon | null>(null);
  protected readonly text = signal('');

  agInit(params: ICellRendererParams<Row> & IconTextCellParams<Row>): void {
    this.show(params);
  }

  refresh(params: ICellRendererParams<Row> & IconTextCellParams<Row>): boolean {
    this.show(params);
    return true;
  }

  private show(params: ICellRendererParams<Row> & IconTextCellParams<Row>): void {
    this.icon.set(params.data ? params.iconOf(params.data) : null);
    this.text.set(String(params.valueFormatted ?? params.value ?? ''));
  }
}

/** The part of a column's definition that draws its cells as `IconTextCell`s, by the row's icon. */
export function withIcon<Row>(iconOf: (row: Row) => CellIcon | null): ColumnExtras<Row> {
  return {
    cellRenderer: IconTextCell,
    cellRendererParams: { iconOf } satisfies IconTextCellParams<Row>,
  };
}

/**
 * A status column: each value's words and icon from a table of looks (`statusLooks`), so the
 * status reads in words with its icon beside them.
 */
export function lookColumn<Row, Value extends string>(
  field: ColDefField<Row> & keyof Row,
  headerName: string,
  width: number,
  looks: Record<Value, CellIcon & { label: string }>,
): ColDef<Row> {
  return column.formatted(
    field,
    headerName,
    width,
    (value: Value) => looks[value]?.label ?? '',
    withIcon((row) => looks[row[field] as Value]),
  );
}
