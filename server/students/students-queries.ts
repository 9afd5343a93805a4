import { z } from 'zod';
import { and, asc, count, desc, eq, inArray, or, sql, type AnyColumn, type SQL } from 'drizzle-orm';
import type { ListResponse } from '@shared/api/list';
import { studentFiltersSchema, type Student } from '@shared/api/student';
import type { Database } from '../db/client';
import { schools, studentCounts, students } from '../db/schema/index';
import { badRequest } from '../core/errors';
import { likePattern, parseListQuery } from '../core/list-query';
import { schoolScope, type Actor } from '../core/policy';
import { currentSchoolYearId, findCurrentSchoolYear } from '../enrollments/school-year';
import { listStudentsOfYear } from './students-of-year';
import { seatSummaries } from './student-seats';
import { studentColumns, toStudent, type StudentRecord } from './student-row';

/**
 * A listed row: the student, and its last change as PostgreSQL's own text, which keeps the
 * microseconds a JavaScript Date would drop (a cursor must hold the exact key).
 */
type ListedRecord = StudentRecord & { updatedAtText: string };
const listedColumns = {
  ...studentColumns,
  updatedAtText: sql<string>`${students.updatedAt}::text`,
};

/** One column of a sort, and the field of a listed row that holds its value for a cursor. */
type SortColumn = [column: AnyColumn, key: keyof ListedRecord];

/**
 * Each sort field and the full ORDER BY it stands for. Every list ends in the id so pages never
 * repeat or skip a row, and each order matches an index of the students table (the school sort
 * walks the few schools by code and each school's name index).
 */
const sortOrders: Record<string, SortColumn[]> = {
  lastName: [
    [students.lastName, 'lastName'],
    [students.firstName, 'firstName'],
    [students.id, 'id'],
  ],
  firstName: [
    [students.firstName, 'firstName'],
    [students.lastName, 'lastName'],
    [students.id, 'id'],
  ],
  studentNumber: [
    [students.studentNumber, 'studentNumber'],
    [students.id, 'id'],
  ],
  grade: [
    [students.grade, 'grade'],
    [students.lastName, 'lastName'],
    [students.firstName, 'firstName'],
    [students.id, 'id'],
  ],
  school: [
    [schools.code, 'schoolCode'],
    [students.lastName, 'lastName'],
    [students.firstName, 'firstName'],
    [students.id, 'id'],
  ],
  status: [
    [students.status, 'status'],
    [students.lastName, 'lastName'],
    [students.firstName, 'firstName'],
    [students.id, 'id'],
  ],
  updatedAt: [
    [students.updatedAt, 'updatedAtText'],
    [students.id, 'id'],
  ],
};

/** A cursor: the sort it was made for and the last row's key in that sort. */
const cursorSchema = z.object({
  sort: z.string(),
  key: z.array(z.union([z.string(), z.number()])),
});

/** The opaque `after` cursor for the row a page ended on (base64url JSON, RFC 4648 §5). */
function cursorAfter(sort: string, record: ListedRecord): string {
  const key = sortOrders[sort.split(':')[0]!]!.map(([, field]) => record[field]);
  return Buffer.from(JSON.stringify({ sort, key })).toString('base64url');
}

const badCursor = (message: string) => badRequest(message, [{ field: 'after', message }]);

/**
 * The condition "after this key" for a sort, as one row comparison, which a B-tree index on the
 * same columns answers as a range (PostgreSQL row constructor comparison): `>` ascending, `<`
 * descending, every column of a sort running the same way.
 */
function afterCondition(after: string, sort: string): SQL {
  let cursor: z.infer<typeof cursorSchema>;
  try {
    cursor = cursorSchema.parse(JSON.parse(Buffer.from(after, 'base64url').toString('utf8')));
  } catch {
    throw badCursor('The cursor is not one this server gave out.');
  }
  if (cursor.sort !== sort) {
    throw badCursor(`The cursor was made for the sort ${cursor.sort}, not ${sort}.`);
  }
  const columns = sortColumns(sort);
  const key = cursor.key;
  // Numbers for number columns; text for the rest (a timestamp as PostgreSQL wrote it).
  const expected = columns.map((column) => (column.dataType === 'number' ? 'number' : 'string'));
  if (
    key.length !== columns.length ||
    key.some((value, index) => typeof value !== expected[index])
  ) {
    throw badCursor('The cursor is not one this server gave out.');
  }
  return keyCondition(sort, key, sort.endsWith(':desc') ? '<' : '>');
}

/** The columns of a known sort (`field:direction`), in order. */
function sortColumns(sort: string): AnyColumn[] {
  return sortOrders[sort.split(':')[0]!]!.map(([column]) => column);
}

/** A sort's columns compared, as one row, with a key of values in that sort (see above). */
function keyCondition(sort: string, key: (string | number)[], operator: '<' | '>' | '<=' | '>=') {
  const columns = sortColumns(sort);
  const values = key.map((value, index) =>
    columns[index]!.dataType === 'date' ? sql`${value}::timestamptz` : sql`${value}`,
  );
  return sql`(${sql.join(columns, sql`, `)}) ${sql.raw(operator)} (${sql.join(values, sql`, `)})`;
}

/**
 * From this offset on, a page first finds the key of its first row, selecting only the sort's
 * columns, and then reads its rows from that key. Walking the offset over the sort's index alone
 * is an index-only scan where the table's visibility map is current (the import and the seed
 * vacuum the roster: server/db/statistics.ts); walking it with every column visits each row.
 * The school sort joins the schools, so it keeps the plain offset.
 */
export const keyFirstFrom = 500;

/**
 * The key, in `sort`, of the row `offset` rows into the students matching `where` (read in the
 * reverse order when `reversed`); undefined past the end.
 */
async function keyAt(
  db: Database,
  sort: string,
  where: SQL | undefined,
  offset: number,
  reversed: boolean,
): Promise<(string | number)[] | undefined> {
  const columns = sortColumns(sort);
  const fields = Object.fromEntries(
    columns.map((column, index) => [
      `k${index}`,
      column.dataType === 'date' ? sql<string>`${column}::text` : sql<string | number>`${column}`,
    ]),
  );
  const [row] = await db
    .select(fields)
    .from(students)
    .where(where)
    .orderBy(...orderBy(sort, reversed))
    .limit(1)
    .offset(offset);
  return row ? columns.map((_, index) => row[`k${index}`] as string | number) : undefined;
}

/**
 * The ORDER BY for a sort, or its exact reverse (each column's direction flipped, which also
 * flips PostgreSQL's default NULLS placement), for reading a page from the far end.
 */
function orderBy(sort: string, reversed = false): SQL[] {
  const [field, direction] = sort.split(':') as [string, 'asc' | 'desc'];
  const columns = sortOrders[field]?.map(([column]) => column);
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
// A seat in the current school year; none before a year is set up.
function seatedCondition(seat: SQL): SQL {
  return sql`exists (select 1 from enrollments seat where seat.student_id = "students"."id" and seat.active and seat.school_year_id = ${currentSchoolYearId} and ${seat})`;
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
 * indexes instead of filtering its way down the whole sort index. A page after a cursor starts
 * at the cursor and ignores the offset.
 */
export function pagePlan(
  page: { offset: number; limit: number },
  total: number,
  options: { search: boolean; afterCursor?: boolean },
): { offset: number; limit: number; reversed: boolean; fenced: boolean } | undefined {
  const fenced = options.search && total < sortMatchesBelow;
  if (options.afterCursor) return { offset: 0, limit: page.limit, reversed: false, fenced };
  if (page.offset >= total) return undefined;
  const limit = Math.min(page.limit, total - page.offset);
  if (!fenced && page.offset + limit / 2 > total / 2) {
    return { offset: total - page.offset - limit, limit, reversed: true, fenced };
  }
  return { offset: page.offset, limit, reversed: false, fenced };
}

/** A parsed student list query: paging, sort, search and the student filters. */
type StudentListQuery = ReturnType<typeof parseListQuery<typeof studentFiltersSchema>>;

/**
 * The list's scope and filters as conditions on `students`, and the same on the per-school
 * counts (`countConditions`) for the filters the counts can answer.
 */
async function filterConditions(db: Database, actor: Actor, list: StudentListQuery) {
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
  if (list.ensembleId !== undefined) {
    conditions.push(seatedCondition(sql`seat.ensemble_id = ${list.ensembleId}`));
  }
  if (list.instrumentId) {
    conditions.push(seatedCondition(sql`seat.instrument_id = ${list.instrumentId}`));
  }
  return { conditions, countConditions };
}

/**
 * The students the actor may see, searched, filtered, sorted and paged; with `next`, the cursor
 * for the page after this one when the page is full.
 */
export async function listStudents(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<Student> & { next?: string }> {
  const list = parseListQuery(query, studentFiltersSchema);
  if (list.schoolYearId !== undefined) {
    const current = await findCurrentSchoolYear(db);
    if (current?.id !== list.schoolYearId)
      return listStudentsOfYear(db, actor, { ...list, schoolYearId: list.schoolYearId });
  }
  const sort = list.sort ?? 'lastName:asc';
  const order = orderBy(sort);
  const after = list.after ? afterCondition(list.after, sort) : undefined;
  const { conditions, countConditions } = await filterConditions(db, actor, list);
  const where = and(...conditions);
  const countsSuffice = !list.q && list.ensembleId === undefined && !list.instrumentId;
  const [{ total }] = countsSuffice
    ? ((await db
        .select({ total: sql<number>`coalesce(sum(${studentCounts.students}), 0)::int` })
        .from(studentCounts)
        .where(and(...countConditions))) as [{ total: number }])
    : ((await db.select({ total: count() }).from(students).where(where)) as [{ total: number }]);
  const plan = pagePlan(list, total, { search: Boolean(list.q), afterCursor: Boolean(after) });
  if (!plan) return { rows: [], total };
  // A deep page starts at its first row's key (see keyFirstFrom).
  let from: SQL | undefined;
  if (!plan.fenced && !after && plan.offset >= keyFirstFrom && !sort.startsWith('school:')) {
    const key = await keyAt(db, sort, where, plan.offset, plan.reversed);
    if (!key) return { rows: [], total };
    const descending = sort.endsWith(':desc') !== plan.reversed;
    from = keyCondition(sort, key, descending ? '<=' : '>=');
    plan.offset = 0;
  }
  const source = plan.fenced
    ? // The limit is the fence; it cuts nothing, as a fenced search has fewer matches.
      db.select().from(students).where(where).limit(sortMatchesBelow).as('students')
    : students;
  const records = await db
    .select(listedColumns)
    .from(source)
    .innerJoin(schools, eq(schools.id, students.schoolId))
    .where(and(plan.fenced ? undefined : where, after, from))
    .orderBy(...(plan.reversed ? orderBy(sort, true) : order))
    .limit(plan.limit)
    .offset(plan.offset);
  if (plan.reversed) records.reverse();
  const last = records.at(-1);
  const next = last && records.length === list.limit ? cursorAfter(sort, last) : undefined;
  const seats = await seatSummaries(
    db,
    records.map((record) => record.id),
    currentSchoolYearId,
  );
  return {
    rows: records.map((record) => toStudent(record, seats(record.id), actor)),
    total,
    ...(next ? { next } : {}),
  };
}
