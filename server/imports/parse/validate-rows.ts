import {
  quoteValue,
  rosterFieldLabels,
  rosterRowSchema,
  type RosterField,
  type RosterRow,
} from '@shared/roster';
import type { ParsedRoster, RowError } from './parsed-roster';

/** A would-be roster row and where each of its values came from, for the errors. */
export interface RosterCandidate {
  /** The line the row is reported on. */
  line: number;
  /** The cells, by roster field; a missing field is an empty cell. */
  values: Partial<Record<RosterField, string>>;
  /** The column (header, or `file.csv:column`) each field came from. */
  columns: Readonly<Partial<Record<RosterField, string>>>;
  /** The line a field came from when it is not `line` (a bundle joins several files). */
  fieldLines?: Partial<Record<RosterField, number>>;
  /** Where to report a problem with the row as a whole, such as a student listed twice. */
  rowColumn: string;
  /** How a message names the row's place when `line N` alone is unclear, e.g. `users.csv line 4`. */
  place?: string;
}

/** Checks beyond the row itself. */
export interface RosterChecks {
  /** The district's school codes; a row at any other school is an error. */
  knownSchoolCodes?: ReadonlySet<string>;
}

// Fields that describe the student rather than the enrolment: every row of one student must agree.
const studentFields = ['firstName', 'lastName', 'grade', 'schoolCode'] as const;

function ensembleKey(row: RosterRow): string {
  return `${row.studentId}\u0000${(row.ensemble ?? '').toLowerCase()}`;
}

function sourceOf(candidate: RosterCandidate, field: RosterField): Omit<RowError, 'message'> {
  return {
    line: candidate.fieldLines?.[field] ?? candidate.line,
    column: candidate.columns[field] ?? field,
  };
}

function placeOf(candidate: RosterCandidate): string {
  return candidate.place ?? `line ${candidate.line}`;
}

function schoolList(codes: ReadonlySet<string>): string {
  const sorted = [...codes].sort();
  return sorted.length > 12 ? `${sorted.slice(0, 12).join(', ')}, …` : sorted.join(', ');
}

function describe(field: RosterField, row: RosterRow): string {
  return field === 'grade' && row.grade === 0 ? "'K'" : quoteValue(String(row[field]));
}

/**
 * Validates would-be roster rows one at a time, so that a large upload's rows need not all be
 * held before they are checked. A roster row is one student in one ensemble: the same student in
 * two ensembles is two rows, but the same student twice in one ensemble (or twice with no
 * ensemble) is a duplicate, and every row of one student must agree on name, grade and school.
 * A row with any problem is left out of the rows and its problems are reported.
 */
export class RosterValidator {
  readonly rows: ParsedRoster['rows'] = [];
  readonly errors: RowError[] = [];
  /**
   * The student ids of rows left out for a problem: the file lists such a student in more
   * ensembles than the rows kept show, so their other seats are not read as left.
   */
  readonly skippedStudentIds = new Set<string>();
  private readonly firstInEnsemble = new Map<string, RosterCandidate>();
  private readonly firstRowOfStudent = new Map<
    string,
    { candidate: RosterCandidate; row: RosterRow }
  >();

  constructor(private readonly checks: RosterChecks = {}) {}

  /**
   * Checks one would-be row, keeping it when it passes and its problems when it does not; the
   * student id of a row left out is kept in {@link skippedStudentIds}.
   */
  add(candidate: RosterCandidate): void {
    if (this.accepts(candidate)) return;
    const studentId = candidate.values.studentId?.trim();
    if (studentId) this.skippedStudentIds.add(studentId);
  }

  private accepts(candidate: RosterCandidate): boolean {
    const { errors } = this;
    const parsed = rosterRowSchema.safeParse(candidate.values);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const field = issue.path[0] as RosterField;
        errors.push({ ...sourceOf(candidate, field), message: issue.message });
      }
      return false;
    }
    const row = parsed.data;
    const { knownSchoolCodes } = this.checks;
    if (knownSchoolCodes && !knownSchoolCodes.has(row.schoolCode)) {
      errors.push({
        ...sourceOf(candidate, 'schoolCode'),
        message: `School code ${quoteValue(row.schoolCode)} is not one of the district's schools (${schoolList(knownSchoolCodes)}).`,
      });
      return false;
    }
    const key = ensembleKey(row);
    const earlier = this.firstInEnsemble.get(key);
    if (earlier !== undefined) {
      const inEnsemble = row.ensemble ? ` in ${quoteValue(row.ensemble)}` : ' with no ensemble';
      errors.push({
        line: candidate.line,
        column: candidate.rowColumn,
        message: `Student ${quoteValue(row.studentId)} is listed twice${inEnsemble}; the first is on ${placeOf(earlier)}.`,
      });
      return false;
    }
    const first = this.firstRowOfStudent.get(row.studentId);
    const differing = first && studentFields.find((field) => first.row[field] !== row[field]);
    if (first && differing) {
      const label = rosterFieldLabels[differing].toLowerCase();
      errors.push({
        ...sourceOf(candidate, differing),
        message: `Student ${quoteValue(row.studentId)} has ${label} ${describe(differing, row)} here but ${describe(differing, first.row)} on ${placeOf(first.candidate)}; one student has one ${label}.`,
      });
      return false;
    }
    this.firstInEnsemble.set(key, candidate);
    if (!first) this.firstRowOfStudent.set(row.studentId, { candidate, row });
    this.rows.push({ line: candidate.line, row });
    return true;
  }
}

/** Validates would-be roster rows with a {@link RosterValidator}. */
export function validateRosterCandidates(
  candidates: Iterable<RosterCandidate>,
  checks: RosterChecks = {},
): Pick<ParsedRoster, 'rows' | 'errors' | 'skippedStudentIds'> {
  const validator = new RosterValidator(checks);
  for (const candidate of candidates) validator.add(candidate);
  return {
    rows: validator.rows,
    errors: validator.errors,
    skippedStudentIds: [...validator.skippedStudentIds],
  };
}
