import type { ColDef } from 'ag-grid-community';

/** The rest of a column's definition: its sort, hiding, phone key, renderer… (AG Grid's ColDef). */
export type ColumnExtras<Row> = Omit<ColDef<Row>, 'field' | 'colId' | 'headerName'>;

/** A column's width: pixels, or a share of the free width with a least width in pixels. */
export type ColumnWidth = number | { flex: number; minWidth: number };

function sized<Row>(width: ColumnWidth): ColDef<Row> {
  return typeof width === 'number' ? { width } : { ...width };
}

/** A column showing one field of the row as it comes. */
function fieldColumn<Row>(
  field: ColDef<Row>['field'],
  headerName: string,
  width: ColumnWidth,
  extras: ColumnExtras<Row> = {},
): ColDef<Row> {
  return { field, headerName, ...sized<Row>(width), ...extras };
}

/** A column showing one field through a formatter: a label table, a day, an amount. */
function formattedColumn<Row, Value>(
  field: ColDef<Row>['field'],
  headerName: string,
  width: ColumnWidth,
  format: (value: Value) => string,
  extras: ColumnExtras<Row> = {},
): ColDef<Row> {
  return fieldColumn(field, headerName, width, {
    valueFormatter: ({ value }) => format(value as Value),
    ...extras,
  });
}

/** A column of amounts (counts, money, tempos), right-aligned as numbers are read. */
function amountColumn<Row, Value>(
  field: ColDef<Row>['field'],
  headerName: string,
  width: ColumnWidth,
  format: (value: Value) => string = (value) => String(value ?? ''),
  extras: ColumnExtras<Row> = {},
): ColDef<Row> {
  return formattedColumn(field, headerName, width, format, { type: 'rightAligned', ...extras });
}

/**
 * A column whose text is worked out from the whole row (a school's code, "maker model"); its
 * `colId` is the name the API sorts it by.
 */
function derivedColumn<Row>(
  colId: string,
  headerName: string,
  width: ColumnWidth,
  text: (row: Row) => string | number | null | undefined,
  extras: ColumnExtras<Row> = {},
): ColDef<Row> {
  return {
    colId,
    headerName,
    ...sized<Row>(width),
    valueGetter: ({ data }) => (data ? text(data) : ''),
    ...extras,
  };
}

/**
 * Column definitions for a grid, one line each: `column.field('code', 'Code', 110)`,
 * `column.formatted('status', 'Status', 105, labelled(statusLabels))`, `column.amount(…)`,
 * `column.derived(…)`; each takes the rest of AG Grid's ColDef as its last argument.
 */
export const column = {
  field: fieldColumn,
  formatted: formattedColumn,
  amount: amountColumn,
  derived: derivedColumn,
};

/** A formatter reading a value's words from a table of labels (`statusLabels`), '' for none. */
export function labelled<Value extends string>(
  labels: Partial<Record<Value, string>>,
): (value: Value) => string {
  return (value) => labels[value] ?? '';
}

/** A formatter showing a missing value as `blank` ('—', '') and any other as it is. */
export function orBlank(blank = ''): (value: string | number | null | undefined) => string {
  return (value) => (value === null || value === undefined ? blank : String(value));
}
