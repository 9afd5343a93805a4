import {
  guessMapping,
  mappingProblems,
  restoreNeutralisedCell,
  rosterColumnNames,
  rosterFields,
  type ColumnMapping,
  type RosterField,
} from '@shared/roster';
import { decodeText } from './decode';
import { csvSteps, runToEnd, runYielding } from './parse-csv';
import type { ParsedRoster, RowError } from './parsed-roster';
import { RosterValidator } from './validate-rows';

export type { ParsedRoster, RowError } from './parsed-roster';

/** Options of {@link parseRosterCsv}. */
export interface RosterCsvOptions {
  /** The coordinator's choice of header for each field; guessed from the headers when absent. */
  mapping?: ColumnMapping;
  /** The district's school codes; a row at any other school is an error. */
  knownSchoolCodes?: ReadonlySet<string>;
}

// PKWARE APPNOTE 4.3.7 and 4.3.16: a zip file starts with a local file header (PK 3 4), or with
// the end of central directory record (PK 5 6) when it is empty.
function isZip(bytes: Uint8Array): boolean {
  return (
    bytes.length >= 4 &&
    bytes[0] === 0x50 &&
    bytes[1] === 0x4b &&
    ((bytes[2] === 0x03 && bytes[3] === 0x04) || (bytes[2] === 0x05 && bytes[3] === 0x06))
  );
}

/**
 * Whether an upload is a plain CSV roster or a zip (a OneRoster bundle): the zip signature
 * decides, then a `.zip` file name; everything else is read as CSV.
 */
export function detectRosterKind(fileName: string, bytes: Uint8Array): 'csv' | 'zip' {
  return isZip(bytes) || fileName.toLowerCase().endsWith('.zip') ? 'zip' : 'csv';
}

function unreadable(message: string, totalRows = 0): ParsedRoster {
  const error: RowError = { line: 0, column: '', message };
  return { source: 'csv', headers: [], mapping: {}, rows: [], errors: [error], totalRows };
}

function byLine(first: RowError, second: RowError): number {
  return first.line - second.line;
}

/**
 * Reads a plain CSV roster upload into validated rows. The bytes may be UTF-8 (with or without a
 * byte order mark), UTF-16LE with a byte order mark, or Windows-1252; the delimiter a comma,
 * semicolon or tab. Headers are matched to roster fields by `options.mapping`, or else by
 * {@link guessMapping}; when a required field has no column, that is reported on line 1 and no
 * row is read. Every row goes through the roster row schema and the checks of
 * {@link RosterValidator}. Problems come back as errors, never as exceptions.
 */
export function parseRosterCsv(bytes: Uint8Array, options: RosterCsvOptions = {}): ParsedRoster {
  return runToEnd(rosterCsvSteps(bytes, options));
}

/**
 * {@link parseRosterCsv} for the server: after each `sliceMs` of work it lets other requests
 * run, so a 20,000-row upload does not hold the event loop while it is validated, and a busy
 * server still leaves the import most of each turn.
 */
export async function parseRosterCsvYielding(
  bytes: Uint8Array,
  options: RosterCsvOptions = {},
  sliceMs = 40,
): Promise<ParsedRoster> {
  return runYielding(rosterCsvSteps(bytes, options), sliceMs);
}

/** How many rows are validated between two looks at the clock. */
const rowsPerStep = 250;

function* rosterCsvSteps(
  bytes: Uint8Array,
  options: RosterCsvOptions,
): Generator<void, ParsedRoster> {
  if (isZip(bytes)) {
    return unreadable(
      'This is a zip file (a OneRoster bundle or an Excel workbook), not a CSV file; save the sheet as CSV, or upload it as a OneRoster bundle.',
    );
  }
  const { text } = decodeText(bytes);
  if (text.includes('\u0000')) {
    return unreadable(
      'This file is not a text (CSV) file; export the roster as CSV and try again.',
    );
  }
  if (text.trim() === '') return unreadable('The file is empty.');

  const csv = yield* csvSteps(text, {});
  if (csv.refusal) return { ...unreadable(csv.refusal), refused: csv.refusal };
  const mapping = options.mapping ?? guessMapping(csv.headers);
  const headerErrors: RowError[] = mappingProblems(mapping, csv.headers).map((problem) => ({
    line: 1,
    column: mapping[problem.field] || rosterColumnNames[problem.field],
    message: problem.message,
  }));
  const base = { source: 'csv' as const, headers: csv.headers, mapping };
  if (headerErrors.length > 0) {
    const errors = [...csv.problems, ...headerErrors].sort(byLine);
    return { ...base, rows: [], errors, totalRows: csv.records.length };
  }
  if (csv.records.length === 0) {
    const errors = [
      ...csv.problems,
      { line: 1, column: '', message: 'The file has headers but no roster rows.' },
    ];
    return { ...base, rows: [], errors: errors.sort(byLine), totalRows: 0 };
  }

  const mapped = rosterFields.filter((field) => mapping[field]);
  const rowColumn = mapping.studentId ?? rosterColumnNames.studentId;
  const validator = new RosterValidator(options);
  for (const [index, record] of csv.records.entries()) {
    if (index > 0 && index % rowsPerStep === 0) yield;
    const values: Partial<Record<RosterField, string>> = {};
    for (const field of mapped) {
      values[field] = restoreNeutralisedCell(record.cells[mapping[field] as string] ?? '');
    }
    validator.add({ line: record.line, values, columns: mapping, rowColumn });
  }
  const { rows, errors } = validator;
  return {
    ...base,
    rows,
    skippedStudentIds: [...validator.skippedStudentIds],
    errors: [...csv.problems, ...errors].sort(byLine),
    totalRows: csv.records.length,
  };
}
