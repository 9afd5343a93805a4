import type { ColDef, ValueFormatterParams, ValueGetterParams } from 'ag-grid-community';
import type { CsvColumn } from './grid-csv';

/**
 * A grid column as an export column: the heading it shows, and the text a cell shows, read
 * through the column's own value getter and formatter so the file says what the screen says.
 */
export function columnCsv<Row>(column: ColDef<Row>): CsvColumn<Row> {
  return {
    header: column.headerName ?? column.colId ?? String(column.field ?? ''),
    cell: (row) => {
      const getter = column.valueGetter;
      const value =
        typeof getter === 'function'
          ? getter({ data: row } as ValueGetterParams<Row>)
          : column.field
            ? (row as Record<string, unknown>)[column.field as string]
            : undefined;
      const formatter = column.valueFormatter;
      if (typeof formatter === 'function') {
        return formatter({ value, data: row } as ValueFormatterParams<Row>) ?? '';
      }
      return value === null || value === undefined ? '' : String(value);
    },
  };
}
