import type { RosterRow } from '@shared/roster';
import type { FieldChange, PlannedStudent, PlannedUpdate } from '@shared/api/import';
import type { ParsedRoster } from './parse/parsed-roster';
import type { ImportPlan } from './import-plan';
import type { ExistingStudent, RosterSnapshot } from './roster-snapshot';

/** A student of the database as the plan lists them. */
export function existingAsPlanned(
  student: ExistingStudent,
  snapshot: RosterSnapshot,
): PlannedStudent {
  return {
    studentId: student.studentNumber,
    firstName: student.firstName,
    lastName: student.lastName,
    schoolCode: snapshot.schoolCodeById.get(student.schoolId) ?? '',
    grade: student.grade,
  };
}

/**
 * The active current-year seats each student of the file leaves: for a student whose rows name
 * at least one ensemble, the seats at their school in ensembles some row of the file names but
 * none of theirs does. By student id, in ensemble name order.
 */
export function seatsLeft(
  parsed: ParsedRoster,
  snapshot: RosterSnapshot,
): Map<string, { ensembleId: number; name: string }[]> {
  const ensembleById = new Map<number, { schoolId: number; name: string }>();
  for (const [schoolId, byName] of snapshot.ensembles)
    for (const { id, name } of byName.values()) ensembleById.set(id, { schoolId, name });
  const idOf = (row: RosterRow) => {
    const schoolId = snapshot.schoolIdByCode.get(row.schoolCode);
    if (schoolId === undefined || !row.ensemble) return undefined;
    return snapshot.ensembles.get(schoolId)?.get(row.ensemble.toLowerCase())?.id;
  };
  const spokenOf = new Set<number>();
  const listed = new Map<string, { schoolId: number; ensembles: Set<number> }>();
  for (const { row } of parsed.rows) {
    if (!row.ensemble) continue;
    const schoolId = snapshot.schoolIdByCode.get(row.schoolCode);
    if (schoolId === undefined) continue;
    const entry = listed.get(row.studentId) ?? { schoolId, ensembles: new Set<number>() };
    const id = idOf(row);
    if (id !== undefined) {
      spokenOf.add(id);
      entry.ensembles.add(id);
    }
    listed.set(row.studentId, entry);
  }
  const leaving = new Map<string, { ensembleId: number; name: string }[]>();
  const skipped = new Set(parsed.skippedStudentIds);
  for (const [studentId, { schoolId, ensembles }] of listed) {
    // A row of theirs was left out for a problem: it may name the seat, so none is ended.
    if (skipped.has(studentId)) continue;
    const left: { ensembleId: number; name: string }[] = [];
    for (const [ensembleId, seat] of snapshot.seats.get(studentId) ?? []) {
      const ensemble = ensembleById.get(ensembleId);
      if (!seat.active || !ensemble || ensemble.schoolId !== schoolId) continue;
      if (spokenOf.has(ensembleId) && !ensembles.has(ensembleId))
        left.push({ ensembleId, name: ensemble.name });
    }
    left.sort((first, second) => first.name.localeCompare(second.name));
    if (left.length > 0) leaving.set(studentId, left);
  }
  return leaving;
}

// A row of a student whose own fields change is an updated row, whichever ensemble it is for.
export function hasStudentChange(changes: FieldChange[]): boolean {
  return changes.some((change) => change.field !== 'ensemble' && change.field !== 'instrument');
}

/**
 * What a OneRoster delta takes away, against the database: its `tobedeleted` students who are
 * active (and not listed again in the same delta), and its `tobedeleted` enrolments that match
 * an active seat of the current year. Each ended seat is added to `updatedStudents` as a change.
 */
export function plannedDeltaRemovals(
  parsed: ParsedRoster,
  snapshot: RosterSnapshot,
  updatedStudents: PlannedUpdate[],
): ImportPlan['deltaRemovals'] {
  const removals: ImportPlan['deltaRemovals'] = { studentIds: [], endedSeats: [] };
  if (!parsed.delta) return removals;
  const listed = new Set(parsed.rows.map(({ row }) => row.studentId));
  for (const id of new Set(parsed.delta.withdrawnStudentIds)) {
    const existing = snapshot.students.get(id);
    if (existing?.status === 'active' && !listed.has(id)) removals.studentIds.push(id);
  }
  const withdrawn = new Set(removals.studentIds);
  for (const seat of parsed.delta.endedSeats) {
    const existing = snapshot.students.get(seat.studentId);
    if (!existing || withdrawn.has(seat.studentId)) continue;
    const schoolId = snapshot.schoolIdByCode.get(seat.schoolCode);
    const ensemble =
      schoolId === undefined
        ? undefined
        : snapshot.ensembles.get(schoolId)?.get(seat.ensemble.toLowerCase());
    if (!ensemble || !snapshot.seats.get(seat.studentId)?.get(ensemble.id)?.active) continue;
    if (
      removals.endedSeats.some(
        (ended) => ended.studentId === seat.studentId && ended.ensembleId === ensemble.id,
      )
    )
      continue;
    removals.endedSeats.push({ studentId: seat.studentId, ensembleId: ensemble.id });
    const change: FieldChange = { field: 'ensemble', before: ensemble.name, after: null };
    const update = updatedStudents.find((entry) => entry.studentId === seat.studentId);
    if (update) update.changes.push(change);
    else updatedStudents.push({ ...existingAsPlanned(existing, snapshot), changes: [change] });
  }
  return removals;
}
