import { sql } from 'drizzle-orm';
import type { Overview } from '@shared/api/analytics';
import { intArray, rowsOf } from '../db/client';
import type { Queryable } from '../ladder/ladder-queries';
import type { Actor } from '../core/policy';
import {
  daysBefore,
  mondayOf,
  schoolCondition,
  studentCondition,
  studentsDrill,
  type StudentFilters,
} from './analytics-scope';
import { schoolScope } from '../core/policy';

/** The first and last Monday the weekly chart covers: the current school year up to today. */
export async function weekRange(
  db: Queryable,
  asOf: string,
): Promise<{ from: string; to: string }> {
  const [year] = rowsOf<{ starts_on: string; ends_on: string }>(
    await db.execute(
      sql`select to_char(starts_on, 'YYYY-MM-DD') as starts_on, to_char(ends_on, 'YYYY-MM-DD') as ends_on from school_years where current limit 1`,
    ),
  );
  const last = year && year.ends_on < asOf ? year.ends_on : asOf;
  const first = year && year.starts_on <= last ? year.starts_on : daysBefore(last, 52 * 7 - 1);
  return { from: mondayOf(first), to: mondayOf(last) };
}

/**
 * The weekly counts: from the `pass_off_weeks` summary, or, for one ensemble (which the summary
 * does not know), from that ensemble's students' pass-offs through the heard-on index.
 */
export function weeklySql(
  actor: Actor,
  filters: StudentFilters,
  range: { from: string; to: string },
) {
  if (filters.ensembleId !== undefined) {
    // Driven from the ensemble's seats, then each member's pass-offs by (student, heard_on).
    return sql`
      select to_char(date_trunc('week', p.heard_on), 'YYYY-MM-DD') as "weekStart", count(*)::int as heard,
        count(*) filter (where p.passed)::int as passed
      from (select distinct e.student_id from enrollments e where e.ensemble_id = ${filters.ensembleId} and e.active) m
      join student_attainment a on a.student_id = m.student_id
      join pass_offs p on p.student_id = m.student_id
      where p.heard_on >= ${range.from}::date and p.heard_on < ${range.to}::date + 7
        and ${studentCondition(actor, { ...filters, ensembleId: undefined })}
      group by 1`;
  }
  const grade = filters.grade === undefined ? sql`` : sql`and w.grade = ${filters.grade}`;
  return sql`
    select to_char(w.week_start, 'YYYY-MM-DD') as "weekStart", sum(w.heard)::int as heard, sum(w.passed)::int as passed
    from pass_off_weeks w
    where w.week_start between ${range.from}::date and ${range.to}::date
      and ${schoolCondition(actor, sql`w.school_id`, filters)} ${grade}
    group by 1`;
}

/** Pass-offs heard per week of the school year so far, every week present (0 when quiet). */
export async function passOffsPerWeek(
  db: Queryable,
  actor: Actor,
  filters: StudentFilters,
  asOf: string,
): Promise<Overview['passOffsPerWeek']> {
  const range = await weekRange(db, asOf);
  const rows = rowsOf<{ weekStart: string; heard: number; passed: number }>(
    await db.execute(weeklySql(actor, filters, range)),
  );
  const byWeek = new Map(rows.map((row) => [row.weekStart, row]));
  const weeks: Overview['passOffsPerWeek'] = [];
  const drillFilters: Record<string, number> = {};
  if (filters.schoolId !== undefined) drillFilters['schoolId'] = filters.schoolId;
  if (filters.ensembleId !== undefined) drillFilters['ensembleId'] = filters.ensembleId;
  for (let week = range.from; week <= range.to; week = daysBefore(week, -7)) {
    const row = byWeek.get(week);
    weeks.push({
      weekStart: week,
      heard: row?.heard ?? 0,
      passed: row?.passed ?? 0,
      drill: {
        path: '/api/pass-offs',
        query: { ...drillFilters, from: week, to: daysBefore(week, -6) },
      },
    });
  }
  return weeks;
}

/** Counts active students with no pass-off since the cutoff (or none at all). */
export function stalledSql(actor: Actor, filters: StudentFilters, cutoff: string) {
  return sql`
    select count(*)::int as students
    from student_attainment a
    where ${studentCondition(actor, filters)} and (a.last_pass_off_on is null or a.last_pass_off_on < ${cutoff}::date)`;
}

/** Active students with no pass-off for `days` days. */
export async function stalledStudents(
  db: Queryable,
  actor: Actor,
  filters: StudentFilters & { asOf?: string | undefined },
  asOf: string,
  days: number,
): Promise<Overview['stalled']> {
  const [row] = rowsOf<{ students: number }>(
    await db.execute(stalledSql(actor, filters, daysBefore(asOf, days))),
  );
  return { days, students: row!.students, drill: studentsDrill(filters, { stalledDays: days }) };
}

/** Directors of the schools in scope whose last pass-off entry is older than the cutoff. */
export function quietDirectorsSql(actor: Actor, filters: StudentFilters, cutoff: string) {
  const scope = schoolScope(actor);
  const inScope = scope === 'all' ? sql`` : sql`and us.school_id = any(${intArray(scope)}::int[])`;
  const school =
    filters.schoolId === undefined ? sql`` : sql`and us.school_id = ${filters.schoolId}`;
  return sql`
    select d.* from (
      select u.id as "userId", u.name, u.email,
        array_agg(distinct sc.code order by sc.code) as "schoolCodes",
        (select to_char(max(p.heard_on), 'YYYY-MM-DD') from pass_offs p where p.heard_by = u.id) as "lastEntryOn"
      from users u
      join user_schools us on us.user_id = u.id
      join schools sc on sc.id = us.school_id
      where u.role = 'director' and u.active ${inScope} ${school}
      group by u.id, u.name, u.email
    ) d
    where d."lastEntryOn" is null or d."lastEntryOn" < ${cutoff}
    order by d."lastEntryOn" nulls first, d.name`;
}

/** Directors who entered no pass-off for `days` days. */
export async function quietDirectors(
  db: Queryable,
  actor: Actor,
  filters: StudentFilters,
  asOf: string,
  days: number,
): Promise<Overview['quietDirectors']> {
  const directors = rowsOf<Overview['quietDirectors']['directors'][number]>(
    await db.execute(quietDirectorsSql(actor, filters, daysBefore(asOf, days))),
  );
  return { days, directors };
}
