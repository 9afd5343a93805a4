import { sql, type SQL } from 'drizzle-orm';
import { districtToday } from '../district/district-clock';
import { schoolScope, assertInScope, type Actor } from '../core/policy';
import type { Drill } from '@shared/api/analytics';
import { intArray } from '../db/client';

/** The filters every analytics figure takes. */
export interface StudentFilters {
  schoolId?: number | undefined;
  grade?: number | undefined;
  ensembleId?: number | undefined;
}

/**
 * The condition on `student_attainment a` for the active students of the actor's schools that
 * match the filters (the summary row carries each student's school, grade and status). A school
 * filter outside the actor's schools is a 404, as the school itself would be.
 */
export function studentCondition(actor: Actor, filters: StudentFilters): SQL {
  const parts: SQL[] = [sql`a.active`];
  const scope = schoolScope(actor);
  if (scope !== 'all') parts.push(sql`a.school_id = any(${intArray(scope)}::int[])`);
  if (filters.schoolId !== undefined) {
    assertInScope(actor, filters.schoolId, 'That school');
    parts.push(sql`a.school_id = ${filters.schoolId}`);
  }
  if (filters.grade !== undefined) parts.push(sql`a.grade = ${filters.grade}`);
  if (filters.ensembleId !== undefined) {
    parts.push(
      sql`exists (select 1 from enrollments e where e.student_id = a.student_id and e.ensemble_id = ${filters.ensembleId} and e.active)`,
    );
  }
  return sql.join(parts, sql` and `);
}

/** The school filter on a table with a `school_id` column, for the weekly counts. */
export function schoolCondition(actor: Actor, column: SQL, filters: StudentFilters): SQL {
  const parts: SQL[] = [sql`true`];
  const scope = schoolScope(actor);
  if (scope !== 'all') parts.push(sql`${column} = any(${intArray(scope)}::int[])`);
  if (filters.schoolId !== undefined) parts.push(sql`${column} = ${filters.schoolId}`);
  return sql.join(parts, sql` and `);
}

/** A drill to the students list with the figure's own filters added to the page's. */
export function studentsDrill(
  filters: StudentFilters & { asOf?: string | undefined },
  extra: Drill['query'],
): Drill {
  const query: Drill['query'] = {};
  for (const [name, value] of Object.entries(filters)) if (value !== undefined) query[name] = value;
  return { path: '/api/analytics/students', query: { ...query, ...extra } };
}

/** The ISO date a number of days before a day. */
export function daysBefore(isoDate: string, days: number): string {
  const date = new Date(`${isoDate}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() - days);
  return date.toISOString().slice(0, 10);
}

/** The Monday of the ISO week (ISO 8601 weeks start on Monday) a day falls in. */
export function mondayOf(isoDate: string): string {
  const date = new Date(`${isoDate}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() - ((date.getUTCDay() + 6) % 7));
  return date.toISOString().slice(0, 10);
}

/** Today as an ISO date, in the district's time zone (so "this week" is the district's week). */
export function today(): string {
  return districtToday();
}
