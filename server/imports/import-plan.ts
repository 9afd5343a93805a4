import { formatGradeLevel, type ColumnMapping, type RosterRow } from '@shared/roster';
import type {
  FieldChange,
  ImportResult,
  PlannedEnsemble,
  PlannedStudent,
  PlannedUpdate,
} from '@shared/api/import';
import type { Database } from '../db/client';
import type { ParsedRoster, RowError } from './parse/parsed-roster';
import { guessEnsembleKind } from './ensemble-kind';
import { readRosterSnapshot, type ExistingStudent, type RosterSnapshot } from './roster-snapshot';
import {
  existingAsPlanned,
  hasStudentChange,
  plannedDeltaRemovals,
  seatsLeft,
} from './import-plan-seats';

/** How an import treats what the file leaves out and what it gets wrong. */
export interface ImportOptions {
  /** Mark active students of the file's schools who are not in the file as withdrawn. */
  withdrawMissing: boolean;
  /** Commit the valid rows when some rows have errors (otherwise nothing is committed). */
  skipInvalid: boolean;
  /** Every student id the file lists, valid row or not: none of them is ever withdrawn. */
  listedStudentIds?: ReadonlySet<string>;
}

/** What an import would do, worked out against the database; {@link commitImport} carries it out. */
export interface ImportPlan {
  parsed: ParsedRoster;
  options: ImportOptions;
  /** The file's errors and any that stop the import as a whole. */
  errors: RowError[];
  /** Row counts: every valid row is created, updated or unchanged. */
  counts: {
    rows: number;
    validRows: number;
    created: number;
    updated: number;
    unchanged: number;
    withdrawn: number;
  };
  createdStudents: PlannedStudent[];
  updatedStudents: PlannedUpdate[];
  withdrawnStudents: PlannedStudent[];
  /**
   * A OneRoster delta's removals: the students it marks `tobedeleted` (also in
   * `withdrawnStudents`) and the active seats whose enrolment it marks so.
   */
  deltaRemovals: { studentIds: string[]; endedSeats: { studentId: string; ensembleId: number }[] };
  newEnsembles: PlannedEnsemble[];
  /**
   * Current-year seats the file's students leave: a student whose rows name ensembles leaves an
   * ensemble of their school that the file speaks of (some row names it) but not for them.
   * Seats in ensembles no row names are left alone, and so are the seats of a student one of
   * whose rows was left out for a problem.
   */
  endedSeats: { studentId: string; ensembleId: number }[];
  /** The schools the valid rows are at. */
  schoolCodes: string[];
  /** Whether committing would write anything: no errors, or skip-invalid with valid rows left. */
  canCommit: boolean;
  /**
   * What differs from the database as the plan read it: the students to create or change (their
   * own fields or status) and the indexes into `parsed.rows` of the rows whose seat is new or
   * changes. `generation` is the roster generation the plan's reads saw (null when it moved
   * while they ran); the commit writes only these rows while the generation has not moved.
   */
  differences: { generation: string | null; students: Set<string>; seatRows: Set<number> };
}

/** The result of a plan that writes nothing: a dry run, an unreadable file, or one with errors. */
export function uncommittedResult(plan: ImportPlan): ImportResult {
  const { rows, created, updated, unchanged, withdrawn } = plan.counts;
  return { rows, created, updated, unchanged, withdrawn, errors: plan.errors, committed: false };
}

/** A student field the import writes, and the column it lands in. */
export interface StudentColumn {
  field:
    | 'firstName'
    | 'lastName'
    | 'preferredName'
    | 'grade'
    | 'schoolCode'
    | 'guardianName'
    | 'guardianEmail';
  column: string;
}

const everyStudentColumn: readonly StudentColumn[] = [
  { field: 'firstName', column: 'first_name' },
  { field: 'lastName', column: 'last_name' },
  { field: 'preferredName', column: 'preferred_name' },
  { field: 'grade', column: 'grade' },
  { field: 'schoolCode', column: 'school_id' },
  { field: 'guardianName', column: 'guardian_name' },
  { field: 'guardianEmail', column: 'guardian_email' },
];

/**
 * The student columns an import compares and writes: the required ones always, an optional one
 * only when the file has a column for it, so a file without guardians never erases them.
 */
export function writtenStudentColumns(mapping: ColumnMapping): StudentColumn[] {
  const required = new Set(['firstName', 'lastName', 'grade', 'schoolCode']);
  return everyStudentColumn.filter(({ field }) => required.has(field) || Boolean(mapping[field]));
}

/** The first valid row of each student: the one its student fields are taken from. */
export function firstRowOfEachStudent(parsed: ParsedRoster): RosterRow[] {
  const seen = new Map<string, RosterRow>();
  for (const { row } of parsed.rows) if (!seen.has(row.studentId)) seen.set(row.studentId, row);
  return [...seen.values()];
}

function plannedStudent(row: RosterRow): PlannedStudent {
  const { studentId, firstName, lastName, schoolCode, grade } = row;
  return { studentId, firstName, lastName, schoolCode, grade };
}

function studentChanges(
  row: RosterRow,
  existing: ExistingStudent,
  columns: StudentColumn[],
  snapshot: RosterSnapshot,
): FieldChange[] {
  const changes: FieldChange[] = [];
  for (const { field } of columns) {
    let before: string | null;
    let after: string | null;
    if (field === 'grade') {
      before = formatGradeLevel(existing.grade);
      after = formatGradeLevel(row.grade);
    } else if (field === 'schoolCode') {
      before = snapshot.schoolCodeById.get(existing.schoolId) ?? null;
      after = row.schoolCode;
    } else {
      before = existing[field] ?? null;
      after = row[field] ?? null;
    }
    if (before !== after) changes.push({ field, before, after });
  }
  if (existing.status !== 'active')
    changes.push({ field: 'status', before: existing.status, after: 'active' });
  return changes;
}

/**
 * Works out what importing the parsed rows would do, diffing by the district's student id:
 * which rows create students, which change them (field by field, seats included), which change
 * nothing, which ensembles would be created, and (with `withdrawMissing`) which active students
 * of the file's schools the file leaves out. Reads the database in a few set-based queries and
 * writes nothing.
 */
export async function planImport(
  db: Database,
  parsed: ParsedRoster,
  options: ImportOptions,
): Promise<ImportPlan> {
  // A delta lists changes only: no student is withdrawn for being left out of it.
  if (parsed.delta) options = { ...options, withdrawMissing: false };
  const students = firstRowOfEachStudent(parsed);
  const schoolCodes = [...new Set(students.map((row) => row.schoolCode))].sort();
  const snapshot = await snapshotFor(db, parsed, options, students, schoolCodes);
  const errors = planErrors(parsed, snapshot, schoolCodes);

  const columns = writtenStudentColumns(parsed.mapping);
  const createdStudents: PlannedStudent[] = [];
  const updatedStudents: PlannedUpdate[] = [];
  const changesOf = new Map<string, FieldChange[]>();
  for (const row of students) {
    const existing = snapshot.students.get(row.studentId);
    if (!existing) {
      createdStudents.push(plannedStudent(row));
      continue;
    }
    changesOf.set(row.studentId, studentChanges(row, existing, columns, snapshot));
  }

  const leaving = seatsLeft(parsed, snapshot);
  const { rowClass, seatRows, newEnsembles } = classifiedRows(parsed, snapshot, changesOf, leaving);
  const differentStudents = new Set(createdStudents.map((student) => student.studentId));
  for (const row of students) {
    const changes = changesOf.get(row.studentId);
    if (changes && changes.length > 0) updatedStudents.push({ ...plannedStudent(row), changes });
    if (changes && hasStudentChange(changes)) differentStudents.add(row.studentId);
  }

  const withdrawnStudents = options.withdrawMissing
    ? studentsLeftOut(students, schoolCodes, snapshot, options)
    : [];
  const deltaRemovals = plannedDeltaRemovals(parsed, snapshot, updatedStudents);
  withdrawnStudents.push(
    ...deltaRemovals.studentIds.map((id) =>
      existingAsPlanned(snapshot.students.get(id)!, snapshot),
    ),
  );

  const count = (kind: RowClass) => rowClass.filter((entry) => entry === kind).length;
  const blocking = errors.some((error) => error.line === 0);
  const changes =
    parsed.rows.length + deltaRemovals.studentIds.length + deltaRemovals.endedSeats.length;
  const canCommit = !blocking && changes > 0 && (errors.length === 0 || options.skipInvalid);
  return {
    parsed,
    options,
    errors,
    counts: {
      rows: parsed.totalRows,
      validRows: parsed.rows.length,
      created: count('created'),
      updated: count('updated') + deltaRemovals.endedSeats.length,
      unchanged: count('unchanged'),
      withdrawn: withdrawnStudents.length,
    },
    createdStudents,
    updatedStudents,
    withdrawnStudents,
    deltaRemovals,
    newEnsembles: [...newEnsembles.values()],
    endedSeats: [...leaving].flatMap(([studentId, seats]) =>
      seats.map((seat) => ({ studentId, ensembleId: seat.ensembleId })),
    ),
    schoolCodes,
    canCommit,
    differences: {
      generation: snapshot.generation,
      students: differentStudents,
      seatRows,
    },
  };
}

/** The database as the plan needs it: the file's students and schools, and a delta's too. */
function snapshotFor(
  db: Database,
  parsed: ParsedRoster,
  options: ImportOptions,
  students: RosterRow[],
  schoolCodes: string[],
): Promise<RosterSnapshot> {
  const { delta } = parsed;
  const deltaIds = delta
    ? [...delta.withdrawnStudentIds, ...delta.endedSeats.map((seat) => seat.studentId)]
    : [];
  const deltaSchools = delta ? delta.endedSeats.map((seat) => seat.schoolCode) : [];
  return readRosterSnapshot(
    db,
    [...new Set([...students.map((row) => row.studentId), ...deltaIds])],
    [...new Set([...schoolCodes, ...deltaSchools])].sort(),
    options.withdrawMissing,
  );
}

/** The file's errors, after those that stop the import as a whole (line 0). */
function planErrors(
  parsed: ParsedRoster,
  snapshot: RosterSnapshot,
  schoolCodes: string[],
): RowError[] {
  const errors = [...parsed.errors];
  const unknownSchools = schoolCodes.filter((code) => !snapshot.schoolIdByCode.has(code));
  for (const code of unknownSchools) {
    errors.unshift({
      line: 0,
      column: '',
      message: `School code '${code}' is not one of the district's schools.`,
    });
  }
  const withSeats = Boolean(parsed.mapping.ensemble) && parsed.rows.some(({ row }) => row.ensemble);
  if (withSeats && !snapshot.schoolYear) {
    errors.unshift({
      line: 0,
      column: '',
      message:
        'No school year is marked current, so the rows’ ensembles have no year to be seated in; set the current school year first.',
    });
  }
  return errors;
}

type RowClass = 'created' | 'updated' | 'unchanged';

/**
 * Each valid row as created, updated or unchanged, the rows whose seat is new or changes, and
 * the ensembles the rows name that do not exist yet. Seat changes join the student's changes.
 */
function classifiedRows(
  parsed: ParsedRoster,
  snapshot: RosterSnapshot,
  changesOf: Map<string, FieldChange[]>,
  leaving: ReturnType<typeof seatsLeft>,
) {
  const firstRowIndex = new Map<string, number>();
  for (const [index, { row }] of parsed.rows.entries())
    if (!firstRowIndex.has(row.studentId)) firstRowIndex.set(row.studentId, index);

  const newEnsembles = new Map<string, PlannedEnsemble>();
  const rowClass: RowClass[] = [];
  const seatRows = new Set<number>();
  for (const [index, { row }] of parsed.rows.entries()) {
    const changes = changesOf.get(row.studentId);
    if (!changes) {
      rowClass.push('created');
    }
    let seatChanged = row.ensemble
      ? seatChangeOf(row, row.ensemble, snapshot, newEnsembles, changes)
      : false;
    const left =
      firstRowIndex.get(row.studentId) === index ? leaving.get(row.studentId) : undefined;
    for (const seat of left ?? []) {
      seatChanged = true;
      changes?.push({ field: 'ensemble', before: seat.name, after: null });
    }
    if (seatChanged) seatRows.add(index);
    if (changes) rowClass.push(seatChanged || hasStudentChange(changes) ? 'updated' : 'unchanged');
  }
  return { rowClass, seatRows, newEnsembles };
}

/**
 * Whether a row's seat is new or changes instrument; the change joins the student's changes
 * (when the student exists) and an ensemble not there yet joins `newEnsembles`.
 */
function seatChangeOf(
  row: RosterRow,
  ensembleName: string,
  snapshot: RosterSnapshot,
  newEnsembles: Map<string, PlannedEnsemble>,
  changes: FieldChange[] | undefined,
): boolean {
  const schoolId = snapshot.schoolIdByCode.get(row.schoolCode);
  const ensemble =
    schoolId === undefined
      ? undefined
      : snapshot.ensembles.get(schoolId)?.get(ensembleName.toLowerCase());
  if (!ensemble) {
    const key = `${row.schoolCode}\u0000${ensembleName.toLowerCase()}`;
    if (!newEnsembles.has(key)) {
      newEnsembles.set(key, {
        schoolCode: row.schoolCode,
        name: ensembleName,
        kind: guessEnsembleKind(ensembleName),
      });
    }
    changes?.push({ field: 'ensemble', before: null, after: ensembleName });
    return true;
  }
  const seat = snapshot.seats.get(row.studentId)?.get(ensemble.id);
  if (!seat || !seat.active) {
    changes?.push({ field: 'ensemble', before: null, after: ensemble.name });
    return true;
  }
  if (row.instrument && row.instrument !== seat.instrumentId) {
    changes?.push({
      field: 'instrument',
      ensemble: ensemble.name,
      before: seat.instrumentId,
      after: row.instrument,
    });
    return true;
  }
  return false;
}

/** The active students of the file's schools whose id the file does not list, by id. */
function studentsLeftOut(
  students: RosterRow[],
  schoolCodes: string[],
  snapshot: RosterSnapshot,
  options: ImportOptions,
): PlannedStudent[] {
  const withdrawnStudents: PlannedStudent[] = [];
  const inFile = new Set(students.map((row) => row.studentId));
  const schoolIds = new Set(schoolCodes.map((code) => snapshot.schoolIdByCode.get(code)));
  for (const student of snapshot.students.values()) {
    if (student.status !== 'active' || !schoolIds.has(student.schoolId)) continue;
    if (inFile.has(student.studentNumber) || options.listedStudentIds?.has(student.studentNumber))
      continue;
    withdrawnStudents.push(existingAsPlanned(student, snapshot));
  }
  withdrawnStudents.sort((first, second) => first.studentId.localeCompare(second.studentId));
  return withdrawnStudents;
}
