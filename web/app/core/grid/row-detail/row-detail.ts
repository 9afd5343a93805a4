import type { ColDef } from 'ag-grid-community';
import { columnCsv } from '../column-csv';

/** One column of a row as the detail sheet lists it: the column's heading and the cell's text. */
export interface RowDetailField {
  label: string;
  value: string;
}

/** A row read out for a phone: the text of the columns in view, and every other column. */
export interface RowDetail {
  /** The shown columns' texts, joined: what the row reads as in the grid. */
  title: string;
  /** The columns the phone's width hides (or the user hid), in the grid's order. */
  fields: RowDetailField[];
}

/** What a grid column is called in the column state (`colId`, else its `field`). */
export function columnIdOf(column: ColDef): string {
  return column.colId ?? String(column.field ?? '');
}

/**
 * Reads a row for the detail sheet. Each text comes through the column's own value getter and
 * formatter (the one the CSV export uses), so the sheet says what a wide screen's cell says.
 */
export function rowDetail<Row>(
  columns: readonly ColDef<Row>[],
  shown: readonly string[],
  row: Row,
): RowDetail {
  const visible = new Set(shown);
  const title = columns
    .filter((column) => visible.has(columnIdOf(column as ColDef)))
    .map((column) => columnCsv(column).cell(row).trim())
    .filter((text) => text !== '')
    .join(' · ');
  const fields = columns
    .filter((column) => !visible.has(columnIdOf(column as ColDef)))
    .map((column) => {
      const csv = columnCsv(column);
      return { label: csv.header, value: csv.cell(row).trim() };
    });
  return { title, fields };
}
