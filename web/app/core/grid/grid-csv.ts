import { csvField } from '@shared/roster/roster-csv';

/** One column of an exported view: its heading and how a row's cell reads as text. */
export interface CsvColumn<Row> {
  header: string;
  cell: (row: Row) => string;
}

/**
 * The rows as CSV text, columns in the given order: a header record, then one record per row,
 * CRLF line breaks and fields quoted where needed (RFC 4180 section 2), every cell (headings
 * too) neutralised against spreadsheet formulas (OWASP "CSV Injection").
 */
export function gridCsv<Row>(columns: readonly CsvColumn<Row>[], rows: readonly Row[]): string {
  const lines = [columns.map((column) => csvField(column.header)).join(',')];
  for (const row of rows) lines.push(columns.map((column) => csvField(column.cell(row))).join(','));
  return `${lines.join('\r\n')}\r\n`;
}
