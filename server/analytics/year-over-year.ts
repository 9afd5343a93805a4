import { sql, type SQL } from 'drizzle-orm';
import {
  retentionStudentsQuerySchema,
  yearOverYearQuerySchema,
  type RetentionStudentList,
  type YearOverYear,
} from '@shared/api/year-over-year';
import type { Database } from '../db/client';
import { intArray, rowsOf } from '../db/client';
import { notFound } from '../core/errors';
import { assertInScope, schoolScope, type Actor } from '../core/policy';
import { parseInput } from '../core/validate';
import { topUpAttainment } from './overview-service';
import { medianOfCounts, rungByGrade, type ComparedYear } from './rung-by-grade';

export { medianOfCounts } from './rung-by-grade';

type YearRow = ComparedYear;

/** The year compared (default the current one) and the year before it, by first day. */
export async function comparedYears(db: Database, schoolYearId: number | undefined) {
  const years = rowsOf<YearRow>(
    await db.execute(
      sql`select id, name, starts_on::text as starts_on, ends_on::text as ends_on, current from school_years order by starts_on`,
    ),
  );
  const index = years.findIndex((year) =>
    schoolYearId === undefined ? year.current : year.id === schoolYearId,
  );
  if (index < 0) throw notFound('That school year');
  return { year: years[index]!, previous: index > 0 ? years[index - 1]! : null, years };
}

/**
 * Last year's players still in the district (promoted or moving up, not graduated or leaving)
 * of the actor's schools, by the school they played at last year. Whether each played in the
 * compared year (the one after) is `student_years.continued`, kept by triggers on the roster and
 * the years, so retention is a grouped count of one indexed table.
 */
function lastYearPlayers(actor: Actor, previous: YearRow, schoolId: number | undefined): SQL {
  const parts: SQL[] = [
    sql`sy.school_year_id = ${previous.id}`,
    sql`sy.outcome in ('promoted', 'moving-up')`,
  ];
  const scope = schoolScope(actor);
  if (scope !== 'all') parts.push(sql`sy.school_id = any(${intArray(scope)}::int[])`);
  if (schoolId !== undefined) parts.push(sql`sy.school_id = ${schoolId}`);
  return sql.join(parts, sql` and `);
}

const share = (part: number, whole: number) => (whole === 0 ? null : part / whole);

/**
 * Retention from the year before: of its players still in the district, those who play in the
 * compared year, by school and by grade transition.
 */
export async function retention(
  db: Database,
  actor: Actor,
  previous: YearRow | null,
  schoolId: number | undefined,
): Promise<YearOverYear['retention']> {
  const figure: YearOverYear['retention'] = {
    total: { players: 0, continued: 0, share: null },
    bySchool: [],
    byTransition: [],
  };
  if (!previous) return figure;
  const groups = rowsOf<{
    school_id: number;
    code: string;
    name: string;
    grade: number;
    players: number;
    continued: number;
    moving: number;
  }>(
    await db.execute(sql`
      select g.school_id, sc.code, sc.name, g.grade, g.players, g.continued, g.moving
      from (select sy.school_id, sy.grade, count(*)::int as players,
          count(*) filter (where sy.continued)::int as continued,
          count(*) filter (where sy.outcome = 'moving-up')::int as moving
        from student_years sy
        where ${lastYearPlayers(actor, previous, schoolId)}
        group by sy.school_id, sy.grade) g
      join schools sc on sc.id = g.school_id
      order by sc.name, g.grade`),
  );
  const bySchool = new Map<number, YearOverYear['retention']['bySchool'][number]>();
  const byGrade = new Map<number, { players: number; continued: number; moving: number }>();
  for (const group of groups) {
    const school = bySchool.get(group.school_id) ?? {
      schoolId: group.school_id,
      code: group.code,
      name: group.name,
      players: 0,
      continued: 0,
      share: null,
    };
    school.players += group.players;
    school.continued += group.continued;
    bySchool.set(group.school_id, school);
    const grade = byGrade.get(group.grade) ?? { players: 0, continued: 0, moving: 0 };
    grade.players += group.players;
    grade.continued += group.continued;
    grade.moving += group.moving;
    byGrade.set(group.grade, grade);
    figure.total.players += group.players;
    figure.total.continued += group.continued;
  }
  figure.total.share = share(figure.total.continued, figure.total.players);
  figure.bySchool = [...bySchool.values()].map((school) => ({
    ...school,
    share: share(school.continued, school.players),
  }));
  figure.byTransition = [...byGrade]
    .sort(([a], [b]) => a - b)
    .map(([grade, counts]) => ({
      fromGrade: grade,
      toGrade: grade + 1,
      players: counts.players,
      continued: counts.continued,
      share: share(counts.continued, counts.players),
      changesSchool: counts.moving * 2 > counts.players,
    }));
  return figure;
}

/**
 * `GET /api/analytics/year-over-year`: retention from the year before, the cohorts' climb, and
 * rung by grade against the year before at the same point of the year.
 */
export async function yearOverYear(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<YearOverYear> {
  const options = parseInput(yearOverYearQuerySchema, query, 'The year-over-year query');
  if (options.schoolId !== undefined) assertInScope(actor, options.schoolId, 'That school');
  const { year, previous, years } = await comparedYears(db, options.schoolYearId);
  // New students and changed seats are recomputed first, as the Overview does: the rung dates
  // and rungs read below are then exact.
  await topUpAttainment(db);
  return {
    year: { id: year.id, name: year.name },
    previousYear: previous ? { id: previous.id, name: previous.name } : null,
    retention: await retention(db, actor, previous, options.schoolId),
    cohorts: await cohortClimb(db, actor, year, years, options.schoolId),
    rungByGrade: await rungByGrade(db, actor, year, previous, options),
  };
}

/**
 * Each cohort (first year on record and the grade then): the median rung of its students who
 * played each year, at that year's end, and now when the compared year is the current one. Only
 * years up to the compared one count; a student counts at the school of that year, so a director
 * sees the climb of the students while at their schools. The closed years' points are the
 * counts the year start wrote (`cohort_rungs`); the current year's are the active students'
 * counts by cohort and rung (`active_rung_counts`, whose cohort is the student's, copied to the
 * summary row; null: they started this year).
 */
export async function cohortClimb(
  db: Database,
  actor: Actor,
  year: YearRow,
  years: YearRow[],
  schoolId: number | undefined,
): Promise<YearOverYear['cohorts']> {
  const scope = schoolScope(actor);
  const inScope = (column: SQL) => {
    const parts: SQL[] = [];
    if (scope !== 'all') parts.push(sql`${column} = any(${intArray(scope)}::int[])`);
    if (schoolId !== undefined) parts.push(sql`${column} = ${schoolId}`);
    return parts.length ? sql` and ${sql.join(parts, sql` and `)}` : sql``;
  };
  // This year's point: the active students' counts by cohort and rung, kept by triggers on the
  // summary rows (active_rung_counts), a few hundred rows instead of every student.
  const now = year.current
    ? sql`union all
        select coalesce(a.cohort_starts_on, ${year.starts_on}::date)::text,
          coalesce(a.cohort_grade, a.grade)::int, ${year.starts_on}::text, a.rung::int,
          sum(a.students)::int
        from active_rung_counts a where true ${inScope(sql`a.school_id`)}
        group by 1, 2, 3, 4 having sum(a.students) > 0`
    : sql``;
  // Medians from counts by rung (rungs are small whole numbers): a hashed count instead of a sort
  // of every row, which is what keeps the figure fast over tens of thousands of students.
  const rows = rowsOf<{
    start_on: string;
    start_grade: number;
    year_on: string;
    rung: number;
    students: number;
  }>(
    await db.execute(sql`
      select c.cohort_starts_on::text as start_on, c.cohort_grade::int as start_grade,
        c.year_starts_on::text as year_on, c.rung::int as rung, sum(c.students)::int as students
      from cohort_rungs c
      where c.year_starts_on <= ${year.starts_on}::date ${inScope(sql`c.school_id`)}
      group by 1, 2, 3, 4
      ${now}
      order by 1, 2, 3, 4`),
  );
  const histograms = new Map<
    string,
    { startOn: string; startGrade: number; yearOn: string; counts: [number, number][] }
  >();
  for (const row of rows) {
    const key = `${row.start_on}:${row.start_grade}:${row.year_on}`;
    const entry = histograms.get(key) ?? {
      startOn: row.start_on,
      startGrade: row.start_grade,
      yearOn: row.year_on,
      counts: [],
    };
    entry.counts.push([row.rung, row.students]);
    histograms.set(key, entry);
  }
  const nameOn = new Map(years.map((entry) => [entry.starts_on, entry.name]));
  const cohorts = new Map<string, YearOverYear['cohorts'][number]>();
  for (const entry of histograms.values()) {
    const key = `${entry.startOn}:${entry.startGrade}`;
    const cohort = cohorts.get(key) ?? {
      startYear: nameOn.get(entry.startOn) ?? entry.startOn,
      startGrade: entry.startGrade,
      points: [],
    };
    cohort.points.push({
      year: nameOn.get(entry.yearOn) ?? entry.yearOn,
      median: medianOfCounts(entry.counts),
      students: entry.counts.reduce((sum, [, count]) => sum + count, 0),
    });
    cohorts.set(key, cohort);
  }
  return [...cohorts.values()];
}

/** `GET /api/analytics/retention/students`: the names behind a retention figure. */
export async function retentionStudents(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<RetentionStudentList> {
  const options = parseInput(retentionStudentsQuerySchema, query, 'The retention list query');
  if (options.schoolId !== undefined) assertInScope(actor, options.schoolId, 'That school');
  const { previous } = await comparedYears(db, options.schoolYearId);
  if (!previous) return { rows: [], total: 0 };
  const parts = [lastYearPlayers(actor, previous, options.schoolId)];
  if (options.grade !== undefined) parts.push(sql`sy.grade = ${options.grade}`);
  if (options.stopped !== undefined)
    parts.push(options.stopped ? sql`not sy.continued` : sql`sy.continued`);
  const where = sql.join(parts, sql` and `);
  const rows = rowsOf<{
    id: number;
    student_number: string;
    first_name: string;
    last_name: string;
    last_school_code: string;
    last_grade: number;
    school_code: string;
    grade: number;
    status: string;
    continued: boolean;
  }>(
    await db.execute(sql`
      select s.id, s.student_number, coalesce(s.preferred_name, s.first_name) as first_name,
        s.last_name, ls.code as last_school_code, sy.grade::int as last_grade, sc.code as school_code,
        s.grade::int as grade, s.status, sy.continued
      from student_years sy
      join students s on s.id = sy.student_id
      join schools ls on ls.id = sy.school_id
      join schools sc on sc.id = s.school_id
      where ${where}
      order by s.last_name, s.first_name, s.id
      offset ${options.offset} limit ${options.limit}`),
  );
  const [counted] = rowsOf<{ total: number }>(
    await db.execute(sql`
      select count(*)::int as total from student_years sy where ${where}`),
  );
  const total = counted?.total ?? 0;
  return {
    rows: rows.map((row) => ({
      id: row.id,
      studentNumber: row.student_number,
      firstName: row.first_name,
      lastName: row.last_name,
      lastSchoolCode: row.last_school_code,
      lastGrade: row.last_grade,
      schoolCode: row.school_code,
      grade: row.grade,
      status: row.status,
      continued: row.continued,
    })),
    total,
  };
}
