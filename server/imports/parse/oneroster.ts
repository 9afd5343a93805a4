import type { ColumnMapping } from '@shared/roster';
import { bundleFileNames, readBundleFiles, type BundleInput } from './oneroster-files';
import { byFileAndLine, readBundleLayout } from './oneroster-manifest';
import { OrgSchools, type OrgMatching } from './oneroster-orgs';
import {
  bundleRecord,
  checkedStatus,
  indexBySourcedId,
  type BundleRecord,
} from './oneroster-records';
import type { ParsedCsv } from './parse-csv';
import { studentCandidates, studentIdOf, type BundleRead } from './oneroster-candidates';
import { guardiansByStudent, usersWithRoles, type BundleUser } from './oneroster-users';
import type { DeltaChanges, ParsedRoster, RowError } from './parsed-roster';
import { validateRosterCandidates, type RosterCandidate, type RosterChecks } from './validate-rows';

// Reads OneRoster CSV bundles per the 1EdTech (IMS Global) "OneRoster v1.1 CSV Tables" (2017;
// v1.1.1 2023) and "OneRoster 1.2 CSV Binding" (2022). Column names are from memory of both:
// users carry sourcedId, status, dateLastModified, enabledUser, username, userIds, givenName,
// familyName, middleName, identifier, email, sms, phone, agentSourcedIds, grades, password, and
// in 1.1 also orgSourcedIds and role, in 1.2 instead userMasterIdentifier, preferredFirstName,
// preferredMiddleName, preferredLastName, pronouns and primaryOrgSourcedId (roles in roles.csv);
// orgs sourcedId, name, type, identifier, parentSourcedId; classes sourcedId, title,
// courseSourcedId, classCode, classType, location, schoolSourcedId, termSourcedIds, subjects,
// periods; enrollments sourcedId, classSourcedId, schoolSourcedId, userSourcedId, role, primary,
// beginDate, endDate.

/** How a 1.1 bundle's columns feed the roster fields. */
export const oneRosterMapping: ColumnMapping = {
  studentId: 'users.csv:identifier',
  firstName: 'users.csv:givenName',
  lastName: 'users.csv:familyName',
  grade: 'users.csv:grades',
  schoolCode: 'orgs.csv:identifier',
  ensemble: 'classes.csv:title',
  instrument: 'classes.csv:title',
  guardianName: 'users.csv:givenName',
  guardianEmail: 'users.csv:email',
};

/** How a 1.2 bundle's columns feed the roster fields: 1.2 adds the preferred first name. */
export const oneRoster12Mapping: ColumnMapping = {
  ...oneRosterMapping,
  preferredName: 'users.csv:preferredFirstName',
};

// A student in three classes is three rows; a wrong grade in users.csv is still one error.
function withoutRepeats(errors: RowError[]): RowError[] {
  const seen = new Set<string>();
  return errors.filter((error) => {
    const key = `${error.line}\u0000${error.column}\u0000${error.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

/** Options of {@link readOneRosterBundle}. */
export type OneRosterOptions = RosterChecks & OrgMatching;

/**
 * Reads a OneRoster 1.1 or 1.2 CSV bundle (zip bytes, a folder path, or a map of file name to
 * content) into validated roster rows; the manifest's `oneroster.version` picks the version.
 * Each student gives one row per class they are enrolled in as a student, the class title being
 * the ensemble, or one row with no ensemble when they have no class; export only the music
 * classes. The student id is the user's `identifier`, else (1.2) its `userMasterIdentifier`,
 * else its `sourcedId`; the grade comes from the CEDS code in `grades` (KG, 01–12); the school
 * is found from the org as {@link OrgSchools} does; the guardian is the first parent or
 * guardian linked through `agentSourcedIds`. The instrument is set only when the class title
 * (or else its subjects) names exactly one instrument.
 *
 * Records marked `tobedeleted`, and enrolments or roles pointing at them, are skipped and
 * counted. A bundle whose manifest marks a file `delta` lists changes only: its rows create or
 * update, its `tobedeleted` students are withdrawn and its `tobedeleted` enrolments end seats
 * (see `delta` in the result). Errors name `file.csv:column` and that file's line. Never
 * rejects on bad input.
 */
export async function readOneRosterBundle(
  input: BundleInput,
  options: OneRosterOptions = {},
): Promise<ParsedRoster> {
  const { files, errors } = await readBundleFiles(input);
  const headers = [...files].flatMap(([name, csv]) =>
    csv.headers.map((header) => `${name}:${header}`),
  );
  const layout = readBundleLayout(files);
  const usersHeaders = new Set(files.get('users.csv')?.headers ?? []);
  const mapping =
    layout.version === '1.2' && usersHeaders.has('preferredFirstName')
      ? oneRoster12Mapping
      : oneRosterMapping;
  const base = { source: 'oneroster' as const, headers, mapping };
  const order = ['', ...bundleFileNames];
  if (layout.problems.length > 0 || files.size === 0) {
    return {
      ...base,
      rows: [],
      errors: [...errors, ...layout.problems].sort(byFileAndLine(order)),
      totalRows: 0,
    };
  }
  const orgFile = indexBySourcedId('orgs.csv', files.get('orgs.csv'), errors);
  const userFile = indexBySourcedId('users.csv', files.get('users.csv'), errors);
  const classFile = indexBySourcedId('classes.csv', files.get('classes.csv'), errors);
  const { users, skippedRoles, roleOf } = usersWithRoles(
    layout.version,
    userFile,
    files.get('roles.csv'),
    errors,
  );
  const read: BundleRead = {
    version: layout.version,
    mapping,
    users,
    userFile,
    classFile,
    orgs: new OrgSchools(orgFile, options, errors),
    errors,
    skipped: orgFile.deleted.size + userFile.deleted.size + classFile.deleted.size + skippedRoles,
    totalRows: 0,
  };
  const delta: DeltaChanges | undefined = layout.delta
    ? { withdrawnStudentIds: [], endedSeats: [] }
    : undefined;
  if (delta) {
    for (const [id, record] of userFile.deleted) {
      const roles = roleOf.get(id);
      if (roles && roles.size > 0 && !roles.has('student')) continue;
      delta.withdrawnStudentIds.push(studentIdOf(record).id);
    }
  }

  const { enrollments, endedEnrollments } = studentEnrollments(read, files.get('enrollments.csv'));
  const guardians = guardiansByStudent(users);
  const candidates: RosterCandidate[] = [];
  for (const [id, user] of users) {
    if (!isStudent(user)) continue;
    candidates.push(
      ...studentCandidates(read, user, guardians.get(id)?.[0]?.record, enrollments.get(id) ?? []),
    );
  }
  if (delta) delta.endedSeats.push(...endedSeats(read, endedEnrollments));

  const validated = validateRosterCandidates(candidates, options);
  return {
    ...base,
    rows: validated.rows,
    skippedStudentIds: validated.skippedStudentIds,
    errors: withoutRepeats([...errors, ...validated.errors]).sort(byFileAndLine(order)),
    totalRows: read.totalRows,
    skipped: read.skipped,
    oneRosterVersion: layout.version,
    ...(delta ? { delta } : {}),
    ...(read.orgs.unmapped.length > 0 ? { unmappedOrgs: read.orgs.unmapped } : {}),
    matchedOrgs: [...read.orgs.matched.values()],
  };
}

function isStudent(user: BundleUser | undefined): boolean {
  return user?.roles.has('student') ?? false;
}

/**
 * The active student enrolments by user sourcedId, and those marked `tobedeleted` (a delta's
 * ended seats). An enrolment of a user who is not a student is an error.
 */
function studentEnrollments(read: BundleRead, csv: ParsedCsv | undefined) {
  const { users, userFile, classFile, errors } = read;
  const enrollments = new Map<string, BundleRecord[]>();
  const endedEnrollments: BundleRecord[] = [];
  for (const record of csv?.records ?? []) {
    const entry = bundleRecord('enrollments.csv', record);
    const status = checkedStatus(entry, errors);
    if (status === undefined) continue;
    if (entry.cell('role').toLowerCase() !== 'student') continue;
    const userId = entry.cell('userSourcedId');
    const classId = entry.cell('classSourcedId');
    if (status === 'tobedeleted') {
      read.skipped++;
      endedEnrollments.push(entry);
      continue;
    }
    // OneRoster: an enrolment of a user or class marked tobedeleted goes with it.
    if (userFile.deleted.has(userId) || classFile.deleted.has(classId)) {
      read.skipped++;
      continue;
    }
    const user = users.get(userId);
    if (!isStudent(user)) {
      const roles = user ? [...user.roles].join(', ') || 'no role' : undefined;
      errors.push({
        line: record.line,
        column: 'enrollments.csv:userSourcedId',
        message: user
          ? `User '${userId}' is enrolled as a student, but users.csv line ${user.record.line} gives them the role ${roles}.`
          : `Student '${userId}' is not in users.csv.`,
      });
      continue;
    }
    const list = enrollments.get(userId);
    if (list) list.push(entry);
    else enrollments.set(userId, [entry]);
  }
  return { enrollments, endedEnrollments };
}

/** A delta's ended seats: its `tobedeleted` enrolments whose student and class the bundle names. */
function endedSeats(
  read: BundleRead,
  endedEnrollments: BundleRecord[],
): DeltaChanges['endedSeats'] {
  const seats: DeltaChanges['endedSeats'] = [];
  for (const enrollment of endedEnrollments) {
    const user = read.users.get(enrollment.cell('userSourcedId'));
    const roomClass =
      read.classFile.active.get(enrollment.cell('classSourcedId')) ??
      read.classFile.deleted.get(enrollment.cell('classSourcedId'));
    // A seat can be ended only when the bundle names the student and the class.
    if (!user || !roomClass) continue;
    const orgId = enrollment.cell('schoolSourcedId') || roomClass.cell('schoolSourcedId');
    const school = read.orgs.schoolOf(orgId, enrollment.line, 'enrollments.csv:schoolSourcedId');
    if (!school || school === 'deleted') continue;
    seats.push({
      studentId: studentIdOf(user.record).id,
      schoolCode: school.schoolCode,
      ensemble: roomClass.cell('title'),
    });
  }
  return seats;
}
