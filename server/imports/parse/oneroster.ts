import { instrumentNamedIn, type ColumnMapping } from '../../../shared/roster';
import {
  bundleFileNames,
  readBundleFiles,
  type BundleFileName,
  type BundleInput,
} from './oneroster-files';
import { bundleStructureProblems, byFileAndLine } from './oneroster-manifest';
import type { CsvRecord, ParsedCsv } from './parse-csv';
import type { ParsedRoster, RowError } from './parsed-roster';
import { validateRosterCandidates, type RosterCandidate, type RosterChecks } from './validate-rows';

// Reads OneRoster 1.1 CSV bundles per the 1EdTech (IMS Global) "OneRoster v1.1 CSV Tables"
// (2017; v1.1.1 2023). The column names used here are from memory, cross-checked with
// open-source importers: users carry sourcedId, status, dateLastModified, enabledUser,
// orgSourcedIds, role, username, userIds, givenName, familyName, middleName, identifier, email,
// sms, phone, agentSourcedIds, grades, password; orgs sourcedId, name, type, identifier,
// parentSourcedId; classes sourcedId, title, courseSourcedId, classCode, classType, location,
// schoolSourcedId, termSourcedIds, subjects, periods; enrollments sourcedId, classSourcedId,
// schoolSourcedId, userSourcedId, role, primary, beginDate, endDate.

/** How a bundle's columns feed the roster fields. */
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

// OneRoster 1.1: users.role is one of administrator, aide, guardian, parent, proctor, relative,
// student, teacher; a student's agentSourcedIds name its parents and guardians (and theirs name
// the student).
const guardianRoles = new Set(['parent', 'guardian']);

interface Indexed {
  record: CsvRecord;
  cell: (column: string) => string;
}

function cellReader(record: CsvRecord): Indexed {
  return { record, cell: (column) => (record.cells[column] ?? '').trim() };
}

// OneRoster 1.1: in a bulk file status is blank; "tobedeleted" marks a record as gone.
function isActive(entry: Indexed): boolean {
  return entry.cell('status').toLowerCase() !== 'tobedeleted';
}

/** OneRoster lists (orgSourcedIds, agentSourcedIds, grades, subjects) are comma-separated. */
function listOf(cell: string): string[] {
  return cell
    .split(',')
    .map((part) => part.trim())
    .filter((part) => part !== '');
}

function bySourcedId(name: BundleFileName, csv: ParsedCsv, errors: RowError[]) {
  const index = new Map<string, Indexed>();
  for (const record of csv.records) {
    const entry = cellReader(record);
    if (!isActive(entry)) continue;
    const id = entry.cell('sourcedId');
    const earlier = index.get(id);
    if (earlier) {
      errors.push({
        line: record.line,
        column: `${name}:sourcedId`,
        message: `sourcedId '${id}' is already used on line ${earlier.record.line} of ${name}.`,
      });
      continue;
    }
    index.set(id, entry);
  }
  return index;
}

function guardiansByStudent(users: Map<string, Indexed>): Map<string, Indexed[]> {
  const found = new Map<string, Indexed[]>();
  const link = (studentId: string, guardian: Indexed) => {
    const list = found.get(studentId) ?? [];
    if (!list.includes(guardian)) list.push(guardian);
    found.set(studentId, list);
  };
  for (const [id, user] of users) {
    if (user.cell('role').toLowerCase() !== 'student') continue;
    for (const agentId of listOf(user.cell('agentSourcedIds'))) {
      const agent = users.get(agentId);
      if (agent && guardianRoles.has(agent.cell('role').toLowerCase())) link(id, agent);
    }
  }
  for (const user of users.values()) {
    if (!guardianRoles.has(user.cell('role').toLowerCase())) continue;
    for (const studentId of listOf(user.cell('agentSourcedIds'))) {
      if (users.get(studentId)?.cell('role').toLowerCase() === 'student') link(studentId, user);
    }
  }
  return found;
}

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
export type OneRosterOptions = RosterChecks;

/**
 * Reads a OneRoster 1.1 CSV bundle (zip bytes, a folder path, or a map of file name to content)
 * into validated roster rows. Each student (users.csv role student) gives one row per class they
 * are enrolled in as a student, the class title being the ensemble, or one row with no ensemble
 * when they have no class; export only the music classes. The student id is the user's
 * `identifier`, else its `sourcedId`; the grade comes from the CEDS code in `grades` (KG, 01–12);
 * the school code is the school org's `identifier` (no guess is made when it is blank); the
 * guardian is the first parent or guardian linked through `agentSourcedIds`. The instrument is
 * set only when the class title (or else its subjects) names exactly one instrument. Errors name
 * `file.csv:column` and that file's line. Never rejects on bad input.
 */
export async function readOneRosterBundle(
  input: BundleInput,
  options: OneRosterOptions = {},
): Promise<ParsedRoster> {
  const { files, errors } = await readBundleFiles(input);
  const headers = [...files].flatMap(([name, csv]) =>
    csv.headers.map((header) => `${name}:${header}`),
  );
  const base = { source: 'oneroster' as const, headers, mapping: oneRosterMapping };
  const order = ['', ...bundleFileNames];
  const structure = bundleStructureProblems(files);
  if (structure.length > 0 || files.size === 0) {
    return {
      ...base,
      rows: [],
      errors: [...errors, ...structure].sort(byFileAndLine(order)),
      totalRows: 0,
    };
  }
  const csv = (name: BundleFileName) => files.get(name) as ParsedCsv;
  const orgs = bySourcedId('orgs.csv', csv('orgs.csv'), errors);
  const users = bySourcedId('users.csv', csv('users.csv'), errors);
  const classes = bySourcedId('classes.csv', csv('classes.csv'), errors);
  const guardians = guardiansByStudent(users);
  const enrollments = new Map<string, Indexed[]>();
  for (const record of csv('enrollments.csv').records) {
    const entry = cellReader(record);
    if (!isActive(entry) || entry.cell('role').toLowerCase() !== 'student') continue;
    const userId = entry.cell('userSourcedId');
    if (users.get(userId)?.cell('role').toLowerCase() !== 'student') {
      errors.push({
        line: record.line,
        column: 'enrollments.csv:userSourcedId',
        message: `Student '${userId}' is not in users.csv (as a user with role student).`,
      });
      continue;
    }
    const list = enrollments.get(userId);
    if (list) list.push(entry);
    else enrollments.set(userId, [entry]);
  }

  const school = (orgId: string, line: number, column: string) => {
    const org = orgs.get(orgId);
    if (!org) {
      errors.push({ line, column, message: `School '${orgId}' is not in orgs.csv.` });
      return undefined;
    }
    if (org.cell('identifier') === '') {
      errors.push({
        line: org.record.line,
        column: 'orgs.csv:identifier',
        message: `School '${org.cell('name')}' has no identifier; the roster needs its school code there.`,
      });
      return undefined;
    }
    return org;
  };

  const candidates: RosterCandidate[] = [];
  let totalRows = 0;
  for (const [id, user] of users) {
    if (user.cell('role').toLowerCase() !== 'student') continue;
    const userLine = user.record.line;
    const identifier = user.cell('identifier');
    const idColumn = identifier ? 'users.csv:identifier' : 'users.csv:sourcedId';
    const guardian = guardians.get(id)?.[0];
    const guardianName = guardian
      ? `${guardian.cell('givenName')} ${guardian.cell('familyName')}`.trim()
      : '';
    const student = {
      studentId: identifier || id,
      firstName: user.cell('givenName'),
      lastName: user.cell('familyName'),
      grade: user.cell('grades'),
      guardianName,
      guardianEmail: guardian?.cell('email') ?? '',
    };
    const columns = { ...oneRosterMapping, studentId: idColumn };
    const guardianLines = guardian
      ? { guardianName: guardian.record.line, guardianEmail: guardian.record.line }
      : {};
    const studentEnrollments = enrollments.get(id) ?? [];
    if (studentEnrollments.length === 0) {
      totalRows++;
      const orgIds = listOf(user.cell('orgSourcedIds'));
      const orgId =
        orgIds.find((candidate) => orgs.get(candidate)?.cell('type').toLowerCase() === 'school') ??
        orgIds[0] ??
        '';
      const org = school(orgId, userLine, 'users.csv:orgSourcedIds');
      if (!org) continue;
      candidates.push({
        line: userLine,
        place: `users.csv line ${userLine}`,
        values: { ...student, schoolCode: org.cell('identifier') },
        columns,
        fieldLines: { ...guardianLines, schoolCode: org.record.line },
        rowColumn: idColumn,
      });
      continue;
    }
    for (const enrollment of studentEnrollments) {
      totalRows++;
      const line = enrollment.record.line;
      const classId = enrollment.cell('classSourcedId');
      const roomClass = classes.get(classId);
      if (!roomClass) {
        errors.push({
          line,
          column: 'enrollments.csv:classSourcedId',
          message: `Class '${classId}' is not in classes.csv.`,
        });
        continue;
      }
      // The enrolment's school, else the class's: OneRoster 1.1 requires both (from memory), but
      // exports leave one blank.
      const org = enrollment.cell('schoolSourcedId')
        ? school(enrollment.cell('schoolSourcedId'), line, 'enrollments.csv:schoolSourcedId')
        : school(
            roomClass.cell('schoolSourcedId'),
            roomClass.record.line,
            'classes.csv:schoolSourcedId',
          );
      if (!org) continue;
      const title = roomClass.cell('title');
      const instrument = instrumentNamedIn(title) ?? instrumentNamedIn(roomClass.cell('subjects'));
      candidates.push({
        line,
        place: `enrollments.csv line ${line}`,
        values: {
          ...student,
          schoolCode: org.cell('identifier'),
          ensemble: title,
          instrument: instrument ?? '',
        },
        columns,
        fieldLines: {
          ...guardianLines,
          studentId: userLine,
          firstName: userLine,
          lastName: userLine,
          grade: userLine,
          schoolCode: org.record.line,
          ensemble: roomClass.record.line,
          instrument: roomClass.record.line,
        },
        rowColumn: 'enrollments.csv:userSourcedId',
      });
    }
  }
  const validated = validateRosterCandidates(candidates, options);
  return {
    ...base,
    rows: validated.rows,
    errors: withoutRepeats([...errors, ...validated.errors]).sort(byFileAndLine(order)),
    totalRows,
  };
}
