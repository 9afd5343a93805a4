import { instrumentNamedIn, type ColumnMapping } from '@shared/roster';
import { bundleFileNames, readBundleFiles, type BundleInput } from './oneroster-files';
import { byFileAndLine, readBundleLayout } from './oneroster-manifest';
import { OrgSchools, type OrgMatching } from './oneroster-orgs';
import {
  bundleRecord,
  checkedStatus,
  indexBySourcedId,
  listOf,
  type BundleRecord,
} from './oneroster-records';
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

/** The student id a user is known by: its `identifier`, else 1.2's master id, else sourcedId. */
function studentIdOf(record: BundleRecord): { id: string; column: string } {
  if (record.cell('identifier'))
    return { id: record.cell('identifier'), column: 'users.csv:identifier' };
  if (record.cell('userMasterIdentifier'))
    return { id: record.cell('userMasterIdentifier'), column: 'users.csv:userMasterIdentifier' };
  return { id: record.cell('sourcedId'), column: 'users.csv:sourcedId' };
}

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
  let skipped =
    orgFile.deleted.size + userFile.deleted.size + classFile.deleted.size + skippedRoles;
  const orgs = new OrgSchools(orgFile, options, errors);
  const guardians = guardiansByStudent(users);
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

  const isStudent = (user: BundleUser | undefined) => user?.roles.has('student') ?? false;
  const enrollments = new Map<string, BundleRecord[]>();
  const endedEnrollments: BundleRecord[] = [];
  for (const record of files.get('enrollments.csv')?.records ?? []) {
    const entry = bundleRecord('enrollments.csv', record);
    const status = checkedStatus(entry, errors);
    if (status === undefined) continue;
    if (entry.cell('role').toLowerCase() !== 'student') continue;
    const userId = entry.cell('userSourcedId');
    const classId = entry.cell('classSourcedId');
    if (status === 'tobedeleted') {
      skipped++;
      if (delta) endedEnrollments.push(entry);
      continue;
    }
    // OneRoster: an enrolment of a user or class marked tobedeleted goes with it.
    if (userFile.deleted.has(userId) || classFile.deleted.has(classId)) {
      skipped++;
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

  const candidates: RosterCandidate[] = [];
  let totalRows = 0;
  for (const [id, user] of users) {
    if (!isStudent(user)) continue;
    const { record } = user;
    const userLine = record.line;
    const { id: studentId, column: idColumn } = studentIdOf(record);
    const guardian = guardians.get(id)?.[0]?.record;
    const guardianName = guardian
      ? `${guardian.cell('givenName')} ${guardian.cell('familyName')}`.trim()
      : '';
    const grades = listOf(record.cell('grades'));
    if (grades.length > 1 && new Set(grades).size > 1) {
      totalRows++;
      errors.push({
        line: userLine,
        column: 'users.csv:grades',
        message: `Student '${studentId}' has several grades (${grades.join(', ')}); a student is in one grade.`,
      });
      continue;
    }
    const student = {
      studentId,
      firstName: record.cell('givenName'),
      lastName: record.cell('familyName'),
      preferredName: record.cell('preferredFirstName'),
      grade: grades[0] ?? '',
      guardianName,
      guardianEmail: guardian?.cell('email') ?? '',
    };
    const columns = { ...mapping, studentId: idColumn };
    const guardianLines = guardian
      ? { guardianName: guardian.line, guardianEmail: guardian.line }
      : {};
    const studentEnrollments = enrollments.get(id) ?? [];
    if (studentEnrollments.length === 0) {
      totalRows++;
      const orgId = user.orgIds.find((candidate) => orgs.isSchoolOrg(candidate)) ?? user.orgIds[0];
      const orgColumn =
        layout.version === '1.2' ? 'users.csv:primaryOrgSourcedId' : 'users.csv:orgSourcedIds';
      if (!orgId) {
        errors.push({
          line: userLine,
          column: orgColumn,
          message: `Student '${studentId}' belongs to no org, so their school is unknown.`,
        });
        continue;
      }
      const school = orgs.schoolOf(orgId, userLine, orgColumn);
      if (school === 'deleted') {
        skipped++;
        continue;
      }
      if (!school) continue;
      candidates.push({
        line: userLine,
        place: `users.csv line ${userLine}`,
        values: { ...student, schoolCode: school.schoolCode },
        columns,
        fieldLines: { ...guardianLines, schoolCode: school.line },
        rowColumn: idColumn,
      });
      continue;
    }
    for (const enrollment of studentEnrollments) {
      totalRows++;
      const line = enrollment.line;
      const classId = enrollment.cell('classSourcedId');
      const roomClass = classFile.active.get(classId);
      if (!roomClass) {
        errors.push({
          line,
          column: 'enrollments.csv:classSourcedId',
          message: `Class '${classId}' is not in classes.csv.`,
        });
        continue;
      }
      // The enrolment's school, else the class's: both are required by the specification, but
      // exports leave one blank.
      const school = enrollment.cell('schoolSourcedId')
        ? orgs.schoolOf(enrollment.cell('schoolSourcedId'), line, 'enrollments.csv:schoolSourcedId')
        : orgs.schoolOf(
            roomClass.cell('schoolSourcedId'),
            roomClass.line,
            'classes.csv:schoolSourcedId',
          );
      if (school === 'deleted') {
        skipped++;
        continue;
      }
      if (!school) continue;
      const title = roomClass.cell('title');
      const instrument = instrumentNamedIn(title) ?? instrumentNamedIn(roomClass.cell('subjects'));
      candidates.push({
        line,
        place: `enrollments.csv line ${line}`,
        values: {
          ...student,
          schoolCode: school.schoolCode,
          ensemble: title,
          instrument: instrument ?? '',
        },
        columns,
        fieldLines: {
          ...guardianLines,
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
      });
    }
  }

  if (delta) {
    for (const enrollment of endedEnrollments) {
      const user = users.get(enrollment.cell('userSourcedId'));
      const roomClass =
        classFile.active.get(enrollment.cell('classSourcedId')) ??
        classFile.deleted.get(enrollment.cell('classSourcedId'));
      // A seat can be ended only when the bundle names the student and the class.
      if (!user || !roomClass) continue;
      const orgId = enrollment.cell('schoolSourcedId') || roomClass.cell('schoolSourcedId');
      const school = orgs.schoolOf(orgId, enrollment.line, 'enrollments.csv:schoolSourcedId');
      if (!school || school === 'deleted') continue;
      delta.endedSeats.push({
        studentId: studentIdOf(user.record).id,
        schoolCode: school.schoolCode,
        ensemble: roomClass.cell('title'),
      });
    }
  }

  const validated = validateRosterCandidates(candidates, options);
  return {
    ...base,
    rows: validated.rows,
    skippedStudentIds: validated.skippedStudentIds,
    errors: withoutRepeats([...errors, ...validated.errors]).sort(byFileAndLine(order)),
    totalRows,
    skipped,
    oneRosterVersion: layout.version,
    ...(delta ? { delta } : {}),
    ...(orgs.unmapped.length > 0 ? { unmappedOrgs: orgs.unmapped } : {}),
    matchedOrgs: [...orgs.matched.values()],
  };
}
