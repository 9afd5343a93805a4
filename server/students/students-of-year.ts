import { type AnyColumn, and, asc, count, desc, eq, inArray, sql, type SQL } from 'drizzle-orm';
import type { ListResponse } from '@shared/api/list';
import type { Student } from '@shared/api/student';
import type { Database } from '../db/client';
import { schools, studentYears, students } from '../db/schema/index';
import { matchesText } from '../core/list-query';
import { schoolScope, type Actor } from '../core/policy';
import { seatSummaries } from './student-seats';
import { studentColumns, toStudent } from './student-row';

/** The list's filters and paging, as `parseListQuery` gives them. */
interface YearList {
  schoolYearId: number;
  q?: string;
  schoolId?: number;
  grade?: number;
  sort?: string;
  offset: number;
  limit: number;
}

const sortable: Record<string, AnyColumn | SQL> = {
  lastName: students.lastName,
  firstName: students.firstName,
  studentNumber: students.studentNumber,
  grade: sql`${studentYears.grade}`,
  school: schools.code,
};

/**
 * The students of a past school year, from the history its end recorded (`student_years`):
 * each with that year's school and grade and that year's seats, in the actor's schools of that
 * year. Read-only history: no cursor, plain offset paging, sorted by name, id, grade or school.
 */
export async function listStudentsOfYear(
  db: Database,
  actor: Actor,
  list: YearList,
): Promise<ListResponse<Student>> {
  const scope = schoolScope(actor);
  const conditions: (SQL | undefined)[] = [eq(studentYears.schoolYearId, list.schoolYearId)];
  if (scope !== 'all')
    conditions.push(scope.length ? inArray(studentYears.schoolId, scope) : sql`false`);
  if (list.schoolId !== undefined) conditions.push(eq(studentYears.schoolId, list.schoolId));
  if (list.grade !== undefined) conditions.push(eq(studentYears.grade, list.grade));
  conditions.push(
    matchesText(list.q, [
      students.lastName,
      students.firstName,
      students.preferredName,
      students.studentNumber,
    ]),
  );
  const where = and(...conditions);
  const [field, direction] = (list.sort ?? 'lastName:asc').split(':') as [string, string];
  const column = sortable[field] ?? students.lastName;
  const order = direction === 'desc' ? desc : asc;
  const [rows, [total]] = await Promise.all([
    db
      .select({ ...studentColumns, grade: studentYears.grade, schoolId: studentYears.schoolId })
      .from(studentYears)
      .innerJoin(students, eq(students.id, studentYears.studentId))
      .innerJoin(schools, eq(schools.id, studentYears.schoolId))
      .where(where)
      .orderBy(order(column), order(students.lastName), asc(students.id))
      .limit(list.limit)
      .offset(list.offset),
    db
      .select({ total: count() })
      .from(studentYears)
      .innerJoin(students, eq(students.id, studentYears.studentId))
      .where(where),
  ]);
  const seats = await seatSummaries(
    db,
    rows.map((row) => row.id),
    list.schoolYearId,
  );
  return {
    rows: rows.map((row) => toStudent(row, seats(row.id), actor)),
    total: total!.total,
  };
}
