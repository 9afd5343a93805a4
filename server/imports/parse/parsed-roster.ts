import type { ColumnMapping, RosterRow } from '../../../shared/roster';

/**
 * One problem found in an upload. `line` is the physical line of the file where the record
 * starts (the header is line 1; 0 means the upload as a whole, such as an empty file or a
 * missing bundle file). `column` is the file's own header, or `file.csv:column` for a OneRoster
 * bundle, or a roster column name such as `last_name` when the file has no such column.
 */
export interface RowError {
  line: number;
  column: string;
  message: string;
}

/** A roster upload turned into validated rows and the problems found on the way. */
export interface ParsedRoster {
  source: 'csv' | 'oneroster';
  /** The file's headers (for a bundle, `file.csv:column` for each file read). */
  headers: string[];
  /** Which header fed each roster field. */
  mapping: ColumnMapping;
  /** The rows that passed every check, each with the line its record starts on. */
  rows: { line: number; row: RosterRow }[];
  errors: RowError[];
  /** How many roster rows the upload held, valid or not. */
  totalRows: number;
  /** Why the whole upload was refused, when it goes past a limit (too many columns, a cell too long). */
  refused?: string;
}
