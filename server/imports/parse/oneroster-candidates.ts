import { instrumentNamedIn, type ColumnMapping } from '@shared/roster';
import type { OneRosterVersion } from './oneroster-manifest';
import type { OrgSchools } from './oneroster-orgs';
import { listOf, type BundleRecord, type IndexedFile } from './oneroster-records';
import type { BundleUser } from './oneroster-users';
import type { RowError } from './parsed-roster';
import type { RosterCandidate } from './validate-rows';

// The roster rows a OneRoster bundle's students give (see readOneRosterBundle in oneroster.ts
// for the specifications read and the rules).

/** A bundle as read so far, with the counts the reading keeps. */
export interface BundleRead {
  version: OneRosterVersion;
  mapping: ColumnMapping;
  users: Map<string, BundleUser>;
  userFile: IndexedFile;
  classFile: IndexedFile;
  orgs: OrgSchools;
  errors: RowError[];
  /** Records skipped: marked `tobedeleted`, or pointing at one. */
  skipped: number;
  /** Rows the students give: one per enrolment, or one for a student with none. */
  totalRows: number;
}

/** The student id a user is known by: its `identifier`, else 1.2's master id, else sourcedId. */
export function studentIdOf(record: BundleRecord): { id: string; column: string } {
  if (record.cell('identifier'))
    return { id: record.cell('identifier'), column: 'users.csv:identifier' };
  if (record.cell('userMasterIdentifier'))
    return { id: record.cell('userMasterIdentifier'), column: 'users.csv:userMasterIdentifier' };
  return { id: record.cell('sourcedId'), column: 'users.csv:sourcedId' };
}

/** The rows one student gives: one per enrolment, or one at their own org when they have none. */
export function studentCandidates(
  read: BundleRead,
  user: BundleUser,
  guardian: BundleRecord | undefined,
  enrollments: BundleRecord[],
): RosterCandidate[] {
  const { record } = user;
  const { id: studentId, column: idColumn } = studentIdOf(record);
  const grades = listOf(record.cell('grades'));
  if (grades.length > 1 && new Set(grades).size > 1) {
    read.totalRows++;
    read.errors.push({
      line: record.line,
      column: 'users.csv:grades',
      message: `Student '${studentId}' has several grades (${grades.join(', ')}); a student is in one grade.`,
    });
    return [];
  }
  const student: StudentValues = {
    studentId,
    idColumn,
    values: {
      studentId,
      firstName: record.cell('givenName'),
      lastName: record.cell('familyName'),
      preferredName: record.cell('preferredFirstName'),
      grade: grades[0] ?? '',
      guardianName: guardian
        ? `${guardian.cell('givenName')} ${guardian.cell('familyName')}`.trim()
        : '',
      guardianEmail: guardian?.cell('email') ?? '',
    },
    columns: { ...read.mapping, studentId: idColumn },
    guardianLines: guardian ? { guardianName: guardian.line, guardianEmail: guardian.line } : {},
  };
  if (enrollments.length === 0) {
    read.totalRows++;
    const candidate = unseatedCandidate(read, user, student);
    return candidate ? [candidate] : [];
  }
  return enrollments.flatMap((enrollment) => {
    read.totalRows++;
    const candidate = seatedCandidate(read, user, student, enrollment);
    return candidate ? [candidate] : [];
  });
}

/** A student's own fields as every row of theirs carries them. */
interface StudentValues {
  studentId: string;
  idColumn: string;
  values: RosterCandidate['values'];
  columns: ColumnMapping;
  guardianLines: RosterCandidate['fieldLines'];
}

/** The school found, or undefined; a school marked `tobedeleted` counts as a skipped record. */
function countingDeleted<School>(read: BundleRead, school: School | 'deleted' | undefined) {
  if (school !== 'deleted') return school;
  read.skipped++;
  return undefined;
}

/** The row of a student with no class, at the school of their own org. */
function unseatedCandidate(
  read: BundleRead,
  user: BundleUser,
  student: StudentValues,
): RosterCandidate | undefined {
  const { orgs } = read;
  const userLine = user.record.line;
  const orgId = user.orgIds.find((candidate) => orgs.isSchoolOrg(candidate)) ?? user.orgIds[0];
  const orgColumn =
    read.version === '1.2' ? 'users.csv:primaryOrgSourcedId' : 'users.csv:orgSourcedIds';
  if (!orgId) {
    read.errors.push({
      line: userLine,
      column: orgColumn,
      message: `Student '${student.studentId}' belongs to no org, so their school is unknown.`,
    });
    return undefined;
  }
  const school = countingDeleted(read, orgs.schoolOf(orgId, userLine, orgColumn));
  if (!school) return undefined;
  return {
    line: userLine,
    place: `users.csv line ${userLine}`,
    values: { ...student.values, schoolCode: school.schoolCode },
    columns: student.columns,
    fieldLines: { ...student.guardianLines, schoolCode: school.line },
    rowColumn: student.idColumn,
  };
}

/** The row of one enrolment: the class title is the ensemble, and may name the instrument. */
function seatedCandidate(
  read: BundleRead,
  user: BundleUser,
  student: StudentValues,
  enrollment: BundleRecord,
): RosterCandidate | undefined {
  const { orgs } = read;
  const userLine = user.record.line;
  const line = enrollment.line;
  const classId = enrollment.cell('classSourcedId');
  const roomClass = read.classFile.active.get(classId);
  if (!roomClass) {
    read.errors.push({
      line,
      column: 'enrollments.csv:classSourcedId',
      message: `Class '${classId}' is not in classes.csv.`,
    });
    return undefined;
  }
  // The enrolment's school, else the class's: both are required by the specification, but
  // exports leave one blank.
  const school = countingDeleted(
    read,
    enrollment.cell('schoolSourcedId')
      ? orgs.schoolOf(enrollment.cell('schoolSourcedId'), line, 'enrollments.csv:schoolSourcedId')
      : orgs.schoolOf(
          roomClass.cell('schoolSourcedId'),
          roomClass.line,
          'classes.csv:schoolSourcedId',
        ),
  );
  if (!school) return undefined;
  const title = roomClass.cell('title');
  const instrument = instrumentNamedIn(title) ?? instrumentNamedIn(roomClass.cell('subjects'));
  return {
    line,
    place: `enrollments.csv line ${line}`,
    values: {
      ...student.values,
      schoolCode: school.schoolCode,
      ensemble: title,
      instrument: instrument ?? '',
    },
    columns: student.columns,
    fieldLines: {
      ...student.guardianLines,
      studentId: userLine,
      firstName: userLine,
      lastName: userLine,
      preferredName: userLine,
      grade: userLine,
      schoolCode: school.line,
      ensemble: roomClass.line,
      instrument: roomClass.line,
    },
    rowColumn: 'enrollments.csv:userSourcedId',
  };
}
