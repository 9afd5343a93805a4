import { and, asc, count, desc, eq, inArray, or, sql, type AnyColumn, type SQL } from 'drizzle-orm';
import type { ListResponse } from '../../shared/api/list';
import { studentFiltersSchema, type Student } from '../../shared/api/student';
import type { Database } from '../db/client';
import { schools, studentCounts, students } from '../db/schema/index';
import { badRequest } from '../core/errors';
import { likePattern, parseListQuery } from '../core/list-query';
import { schoolScope, type Actor } from '../core/policy';
import { findCurrentSchoolYear } from '../enrollments/school-year';
import { seatSummaries } from './student-seats';
import { studentColumns, toStudent } from './student-row';

/**
 * Each sort field and the full ORDER BY it stands for. Every list ends in the id so pages never
 * repeat or skip a row, and each order matches an index of the students table (the school sort
 * walks the few schools by code and each school's name index).
 */
const sortOrders: Record<string, AnyColumn[]> = {
  lastName: [students.lastName, students.firstName, students.id],
  firstName: [students.firstName, students.lastName, students.id],
  studentNumber: [students.studentNumber, students.id],
  grade: [students.grade, students.lastName, students.firstName, students.id],
  school: [schools.code, students.lastName, students.firstName, students.id],
  status: [students.status, students.lastName, students.firstName, students.id],
  updatedAt: [students.updatedAt, students.id],
};

/**
 * The ORDER BY for a sort, or its exact reverse (each column's direction flipped, which also
 * flips PostgreSQL's default NULLS placement), for reading a page from the far end.
 */
function orderBy(sort: string | undefined, reversed = false): SQL[] {
  const [field, direction] = (sort ?? 'lastName:asc').split(':') as [string, 'asc' | 'desc'];
  const columns = sortOrders[field];
  if (!columns) {
    throw badRequest(
      `Cannot sort by '${field}'. Sort by one of: ${Object.keys(sortOrders).join(', ')}.`,
      [{ field: 'sort', message: `Unknown field '${field}'.` }],
    );
  }
  const descending = (direction === 'desc') !== reversed;
  return columns.map((column) => (descending ? desc(column) : asc(column)));
}

/**
 * Each word of the search must begin the student id, first, last or preferred name, so "toby
 * ark" finds Toby Arkwright-Lund; prefix matches use the lower(...) text_pattern_ops indexes.
 */
function searchCondition(q: string): SQL | undefined {
  const words = q
    .split(/[\s,]+/)
    .filter(Boolean)
    .slice(0, 5);
  return and(
    ...words.map((word) => {
      const pattern = likePattern(word, 'prefix');
      return or(
        sql`lower(${students.studentNumber}) like ${pattern}`,
        sql`lower(${students.lastName}) like ${pattern}`,
        sql`lower(${students.firstName}) like ${pattern}`,
        sql`lower(${students.preferredName}) like ${pattern}`,
      );
    }),
  );
}

// Raw SQL with the table named: Drizzle leaves columns unqualified in a one-table select.
function seatedCondition(schoolYearId: number, seat: SQL): SQL {
  return sql`exists (select 1 from enrollments seat where seat.student_id = "students"."id" and seat.active and seat.school_year_id = ${schoolYearId} and ${seat})`;
}

/**
 * Below this many matches, a search collects its matches first (through the prefix indexes) and
 * sorts them; above it, walking the sort's index meets a page of matches soon enough.
 */
const sortMatchesBelow = 5_000;

/**
 * How a page is read once the total is known. A page past the middle is read from the far end
 * in the reverse order (an index walks `total - offset` rows instead of `offset`), then turned
 * round; a search with few matches is fenced (a subquery with a LIMIT is not flattened into the
 * outer query by PostgreSQL's planner), so the planner gathers the matches through the prefix
 * indexes instead of filtering its way down the whole sort index.
 */
export function pagePlan(
  page: { offset: number; limit: number },
  total: number,
  options: { search: boolean },
): { offset: number; limit: number; reversed: boolean; fenced: boolean } | undefined {
  if (page.offset >= total) return undefined;
  const fenced = options.search && total < sortMatchesBelow;
  const limit = Math.min(page.limit, total - page.offset);
  if (!fenced && page.offset + limit / 2 > total / 2) {
    return { offset: total - page.offset - limit, limit, reversed: true, fenced };
  }
  return { offset: page.offset, limit, reversed: false, fenced };
}

/** The students the actor may see, searched, filtered, sorted and paged. */
export async function listStudents(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<Student>> {
  const list = parseListQuery(query, studentFiltersSchema);
  const scope = schoolScope(actor);
  const conditions: (SQL | undefined)[] = [];
  // The same filters on the per-school counts, while no filter needs the rows themselves.
  const countConditions: (SQL | undefined)[] = [];
  if (scope !== 'all') {
    conditions.push(scope.length ? inArray(students.schoolId, scope) : sql`false`);
    countConditions.push(scope.length ? inArray(studentCounts.schoolId, scope) : sql`false`);
  }
  if (list.q) conditions.push(searchCondition(list.q));
  if (list.schoolId !== undefined) {
    conditions.push(eq(students.schoolId, list.schoolId));
    countConditions.push(eq(studentCounts.schoolId, list.schoolId));
  }
  if (list.schoolCode) {
    const [school] = await db
      .select({ id: schools.id })
      .from(schools)
      .where(eq(schools.code, list.schoolCode.toUpperCase()));
    conditions.push(school ? eq(students.schoolId, school.id) : sql`false`);
    countConditions.push(school ? eq(studentCounts.schoolId, school.id) : sql`false`);
  }
  if (list.grade !== undefined) {
    conditions.push(eq(students.grade, list.grade));
    countConditions.push(eq(studentCounts.grade, list.grade));
  }
  if (list.status) {
    conditions.push(eq(students.status, list.status));
    countConditions.push(eq(studentCounts.status, list.status));
  }
  const year = await findCurrentSchoolYear(db);
  if (list.ensembleId !== undefined || list.instrumentId) {
    if (!year) conditions.push(sql`false`);
    if (year && list.ensembleId !== undefined) {
      conditions.push(seatedCondition(year.id, sql`seat.ensemble_id = ${list.ensembleId}`));
    }
    if (year && list.instrumentId) {
      conditions.push(seatedCondition(year.id, sql`seat.instrument_id = ${list.instrumentId}`));
    }
  }
  const where = and(...conditions);
  const countsSuffice = !list.q && list.ensembleId === undefined && !list.instrumentId;
  const [{ total }] = countsSuffice
    ? ((await db
        .select({ total: sql<number>`coalesce(sum(${studentCounts.students}), 0)::int` })
        .from(studentCounts)
        .where(and(...countConditions))) as [{ total: number }])
    : ((await db.select({ total: count() }).from(students).where(where)) as [{ total: number }]);
  const plan = pagePlan(list, total, { search: Boolean(list.q) });
  if (!plan) return { rows: [], total };
  const source = plan.fenced
    ? // The limit is the fence; it cuts nothing, as a fenced search has fewer matches.
      db.select().from(students).where(where).limit(sortMatchesBelow).as('students')
    : students;
  const records = await db
    .select(studentColumns)
    .from(source)
    .innerJoin(schools, eq(schools.id, students.schoolId))
    .where(plan.fenced ? undefined : where)
    .orderBy(...orderBy(list.sort, plan.reversed))
    .limit(plan.limit)
    .offset(plan.offset);
  if (plan.reversed) records.reverse();
  const seats = await seatSummaries(
    db,
    records.map((record) => record.id),
    year?.id,
  );
  return {
    rows: records.map((record) => toStudent(record, seats(record.id), actor)),
    total,
  };
}
