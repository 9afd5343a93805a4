import { sql, type SQL } from 'drizzle-orm';
import {
  retentionStudentsQuerySchema,
  yearOverYearQuerySchema,
  type RetentionStudentList,
  type YearOverYear,
} from '../../shared/api/year-over-year';
import type { Database } from '../db/client';
import { intArray, rowsOf } from '../db/client';
import { notFound } from '../core/errors';
import { assertInScope, schoolScope, type Actor } from '../core/policy';
import { parseInput } from '../core/validate';

interface YearRow {
  id: number;
  name: string;
  starts_on: string;
  current: boolean;
}

/** The year compared (default the current one) and the year before it, by first day. */
async function comparedYears(db: Database, schoolYearId: number | undefined) {
  const years = rowsOf<YearRow>(
    await db.execute(
      sql`select id, name, starts_on::text as starts_on, current from school_years order by starts_on`,
    ),
  );
  const index = years.findIndex((year) =>
    schoolYearId === undefined ? year.current : year.id === schoolYearId,
  );
  if (index < 0) throw notFound('That school year');
  return { year: years[index]!, previous: index > 0 ? years[index - 1]! : null, years };
}

/**
 * The condition "played in year Y" on the student `sy.student_id`: for the current year an
 * active student, for a past year a row of Y's history that did not end withdrawn.
 */
function playsIn(year: YearRow): SQL {
  return year.current
    ? sql`exists (select 1 from students s where s.id = sy.student_id and s.status = 'active')`
    : sql`exists (select 1 from student_years ny where ny.student_id = sy.student_id
        and ny.school_year_id = ${year.id} and ny.outcome <> 'withdrawn')`;
}

/**
 * Last year's players still in the district (promoted or moving up, not graduated or leaving)
 * of the actor's schools, by the school they played at last year.
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

/** `GET /api/analytics/year-over-year`: retention from the year before, and the cohorts' climb. */
export async function yearOverYear(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<YearOverYear> {
  const options = parseInput(yearOverYearQuerySchema, query, 'The year-over-year query');
  if (options.schoolId !== undefined) assertInScope(actor, options.schoolId, 'That school');
  const { year, previous, years } = await comparedYears(db, options.schoolYearId);
  const retention: YearOverYear['retention'] = {
    total: { players: 0, continued: 0, share: null },
    bySchool: [],
    byTransition: [],
  };
  if (previous) {
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
            count(*) filter (where ${playsIn(year)})::int as continued,
            count(*) filter (where sy.outcome = 'moving-up')::int as moving
          from student_years sy where ${lastYearPlayers(actor, previous, options.schoolId)}
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
      retention.total.players += group.players;
      retention.total.continued += group.continued;
    }
    retention.total.share = share(retention.total.continued, retention.total.players);
    retention.bySchool = [...bySchool.values()].map((school) => ({
      ...school,
      share: share(school.continued, school.players),
    }));
    retention.byTransition = [...byGrade]
      .sort(([a], [b]) => a - b)
      .map(([grade, counts]) => ({
        fromGrade: grade,
        toGrade: grade + 1,
        players: counts.players,
        continued: counts.continued,
        share: share(counts.continued, counts.players),
        changesSchool: counts.moving * 2 > counts.players,
      }));
  }
  return {
    year: { id: year.id, name: year.name },
    previousYear: previous ? { id: previous.id, name: previous.name } : null,
    retention,
    cohorts: await cohortClimb(db, actor, year, years, options.schoolId),
  };
}

/**
 * Each cohort (first year on record and the grade then): the median rung of its students who
 * played each year, at that year's end (`student_years.rung`), and now when the compared year is
 * the current one. Only years up to the compared one count; a student counts at the school of
 * that year, so a director sees the climb of the students while at their schools.
 */
async function cohortClimb(
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
  const now = year.current
    ? sql`union all select a.student_id, ${year.starts_on}::date, a.grade::int, a.rung::int
        from student_attainment a where a.active ${inScope(sql`a.school_id`)}`
    : sql``;
  const rows = rowsOf<{
    start_on: string;
    start_grade: number;
    year_on: string;
    median: number;
    students: number;
  }>(
    await db.execute(sql`
      with played as (
        select sy.student_id, y.starts_on as year_on, sy.grade, sy.rung
        from student_years sy join school_years y on y.id = sy.school_year_id
        where sy.outcome <> 'withdrawn' and y.starts_on <= ${year.starts_on}::date
          ${inScope(sql`sy.school_id`)}
        ${now}
      ),
      firsts as (
        select distinct on (student_id) student_id, year_on as start_on, grade as start_grade
        from played order by student_id, year_on
      )
      select f.start_on::text as start_on, f.start_grade, p.year_on::text as year_on,
        percentile_cont(0.5) within group (order by p.rung)::float8 as median, count(*)::int as students
      from played p join firsts f using (student_id)
      group by 1, 2, 3 order by 1, 2, 3`),
  );
  const nameOn = new Map(years.map((entry) => [entry.starts_on, entry.name]));
  const cohorts = new Map<string, YearOverYear['cohorts'][number]>();
  for (const row of rows) {
    const key = `${row.start_on}:${row.start_grade}`;
    const cohort = cohorts.get(key) ?? {
      startYear: nameOn.get(row.start_on) ?? row.start_on,
      startGrade: row.start_grade,
      points: [],
    };
    cohort.points.push({
      year: nameOn.get(row.year_on) ?? row.year_on,
      median: row.median,
      students: row.students,
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
  const { year, previous } = await comparedYears(db, options.schoolYearId);
  if (!previous) return { rows: [], total: 0 };
  const parts = [lastYearPlayers(actor, previous, options.schoolId)];
  if (options.grade !== undefined) parts.push(sql`sy.grade = ${options.grade}`);
  const continued = playsIn(year);
  if (options.stopped !== undefined)
    parts.push(options.stopped ? sql`not ${continued}` : continued);
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
    total: number;
  }>(
    await db.execute(sql`
      select s.id, s.student_number, coalesce(s.preferred_name, s.first_name) as first_name,
        s.last_name, ls.code as last_school_code, sy.grade::int as last_grade, sc.code as school_code,
        s.grade::int as grade, s.status, ${continued} as continued, count(*) over ()::int as total
      from student_years sy
      join students s on s.id = sy.student_id
      join schools ls on ls.id = sy.school_id
      join schools sc on sc.id = s.school_id
      where ${where}
      order by s.last_name, s.first_name, s.id
      offset ${options.offset} limit ${options.limit}`),
  );
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
    total: rows[0]?.total ?? 0,
  };
}
