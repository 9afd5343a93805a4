import type { BundleFileName } from './oneroster-files';
import type { CsvRecord, ParsedCsv } from './parse-csv';
import type { RowError } from './parsed-roster';

/** One record of a bundle file, with a reader of its trimmed cells (an absent column is ''). */
export interface BundleRecord {
  file: BundleFileName;
  record: CsvRecord;
  line: number;
  cell: (column: string) => string;
}

/** A bundle record as {@link BundleRecord}. */
export function bundleRecord(file: BundleFileName, record: CsvRecord): BundleRecord {
  return {
    file,
    record,
    line: record.line,
    cell: (column) => (record.cells[column] ?? '').trim(),
  };
}

/**
 * OneRoster 1.1 CSV Tables §2.3 and 1.2 CSV Binding §3.2 (from memory): in a bulk file `status`
 * and `dateLastModified` may be blank; in a delta file `status` is `active` or `tobedeleted`.
 * OneRoster 1.0 also wrote `inactive`, read here as gone too.
 */
export type RecordStatus = 'active' | 'tobedeleted';

const goneStatuses = new Set(['tobedeleted', 'inactive']);

/** The record's status, or a problem when the cell holds something else. */
export function statusOf(entry: BundleRecord): RecordStatus | RowError {
  const status = entry.cell('status');
  const lower = status.toLowerCase();
  if (lower === '' || lower === 'active') return 'active';
  if (goneStatuses.has(lower)) return 'tobedeleted';
  return {
    line: entry.line,
    column: `${entry.file}:status`,
    message: `Status '${status}' is not one OneRoster defines; use active or tobedeleted (or leave it blank in a bulk file).`,
  };
}

// OneRoster 1.1 CSV Tables §2.3 (data types): a DateTime is ISO 8601 in UTC with milliseconds
// ("2026-09-01T14:05:00.000Z"); a Date is "YYYY-MM-DD". Exports write dateLastModified in either
// form, with or without the milliseconds, and sometimes with an offset instead of "Z".
const dateForm = /^\d{4}-\d{2}-\d{2}$/;
const dateTimeForm = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?(Z|[+-]\d{2}:?\d{2})?$/;

/** A `dateLastModified` cell as a time, '' when blank, or undefined when it is not a date. */
export function modifiedAt(value: string): Date | '' | undefined {
  if (value === '') return '';
  if (!dateForm.test(value) && !dateTimeForm.test(value)) return undefined;
  const time = new Date(dateForm.test(value) ? `${value}T00:00:00Z` : value);
  if (Number.isNaN(time.getTime())) return undefined;
  // A calendar date that rolls over ("2026-02-30") is not a date.
  if (time.toISOString().slice(0, 10) !== value.slice(0, 10) && !/[+-]\d{2}:?\d{2}$/.test(value))
    return undefined;
  return time;
}

/**
 * A OneRoster list cell (orgSourcedIds, agentSourcedIds, grades, subjects, userIds) as its
 * values. The CSV binding writes a list as one cell, comma-separated and quoted ("09,10,11",
 * "{LDAP:12},{LTI:15}"); a comma inside braces belongs to the value.
 */
export function listOf(cell: string): string[] {
  const values: string[] = [];
  let depth = 0;
  let current = '';
  for (const character of cell) {
    if (character === '{') depth++;
    if (character === '}' && depth > 0) depth--;
    if (character === ',' && depth === 0) {
      values.push(current);
      current = '';
    } else current += character;
  }
  values.push(current);
  return values.map((value) => value.trim()).filter((value) => value !== '');
}

/** The records of one file, indexed by sourcedId, the ones to be deleted apart. */
export interface IndexedFile {
  active: Map<string, BundleRecord>;
  deleted: Map<string, BundleRecord>;
}

/**
 * Indexes a file's records by `sourcedId`: each active record once (a repeated sourcedId is
 * an error), the `tobedeleted` ones apart, so that references to them are skipped rather than
 * reported. Problems with status and dateLastModified are reported on the record's line.
 */
export function indexBySourcedId(
  file: BundleFileName,
  csv: ParsedCsv | undefined,
  errors: RowError[],
): IndexedFile {
  const active = new Map<string, BundleRecord>();
  const deleted = new Map<string, BundleRecord>();
  for (const record of csv?.records ?? []) {
    const entry = bundleRecord(file, record);
    const status = checkedStatus(entry, errors);
    if (status === undefined) continue;
    const id = entry.cell('sourcedId');
    if (status === 'tobedeleted') {
      deleted.set(id, entry);
      continue;
    }
    const earlier = active.get(id);
    if (earlier) {
      errors.push({
        line: record.line,
        column: `${file}:sourcedId`,
        message: `sourcedId '${id}' is already used on line ${earlier.line} of ${file}.`,
      });
      continue;
    }
    active.set(id, entry);
  }
  return { active, deleted };
}

/** The record's status after checking it and its dateLastModified; undefined when unreadable. */
export function checkedStatus(entry: BundleRecord, errors: RowError[]): RecordStatus | undefined {
  const status = statusOf(entry);
  if (typeof status !== 'string') {
    errors.push(status);
    return undefined;
  }
  const modified = entry.cell('dateLastModified');
  if (modifiedAt(modified) === undefined) {
    errors.push({
      line: entry.line,
      column: `${entry.file}:dateLastModified`,
      message: `dateLastModified '${modified}' is not a date; OneRoster writes 2026-09-01 or 2026-09-01T14:05:00.000Z.`,
    });
  }
  return status;
}
