import type { ColumnMapping, RosterRow } from '@shared/roster';

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
  /**
   * The student ids of rows left out for a problem (when a row's id could be read): a seat of
   * theirs that no kept row names may be one a skipped row names, so it is not ended.
   */
  skippedStudentIds?: string[];
  /** How many roster rows the upload held, valid or not. */
  totalRows: number;
  /** Why the whole upload was refused, when it goes past a limit (too many columns, a cell too long). */
  refused?: string;
  /**
   * Bundle records left out as the OneRoster status asks: records marked `tobedeleted` and the
   * enrolments and roles that point at them. Counted, never reported as errors.
   */
  skipped?: number;
  /** The OneRoster version a bundle was read as. */
  oneRosterVersion?: '1.1' | '1.2';
  /**
   * Set for a OneRoster delta bundle: it lists changes only, so no student it leaves out is
   * withdrawn; the students it marks `tobedeleted` are, and the seats it marks so are ended.
   */
  delta?: DeltaChanges;
  /** The bundle's orgs that matched a school, to remember for later imports. */
  matchedOrgs?: { sourcedId: string; name: string; schoolCode: string }[];
  /** The bundle's orgs that matched no school of the district. */
  unmappedOrgs?: {
    sourcedId: string;
    name: string;
    identifier: string;
    type: string;
    line: number;
  }[];
}

/** What a OneRoster delta bundle takes away. */
export interface DeltaChanges {
  /** The district student ids of the students it marks `tobedeleted`. */
  withdrawnStudentIds: string[];
  /** The seats (a student in an ensemble of a school) whose enrolment it marks `tobedeleted`. */
  endedSeats: { studentId: string; schoolCode: string; ensemble: string }[];
}
