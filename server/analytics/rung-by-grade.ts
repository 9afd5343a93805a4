import { sql, type SQL } from 'drizzle-orm';
import type { RungByGrade } from '@shared/api/year-over-year';
import type { Database } from '../db/client';
import { intArray, rowsOf } from '../db/client';
import { badRequest } from '../core/errors';
import { schoolScope, type Actor } from '../core/policy';
import { today } from './analytics-scope';

/** A school year as the year-over-year figures read it. */
export interface ComparedYear {
  id: number;
  name: string;
  starts_on: string;
  ends_on: string;
  current: boolean;
}

const dayMs = 86_400_000;
const daysBetween = (from: string, to: string) =>
  Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / dayMs);
const addDays = (day: string, days: number) =>
  new Date(Date.parse(`${day}T00:00:00Z`) + days * dayMs).toISOString().slice(0, 10);
const clamp = (day: string, first: string, last: string) =>
  day < first ? first : day > last ? last : day;

/**
 * The median of values given as [value, count] pairs in ascending order of value: the middle
 * value, or the mean of the two middle ones for an even count (as PostgreSQL's
 * percentile_cont(0.5) answers).
 */
export function medianOfCounts(counts: readonly (readonly [number, number])[]): number {
  const total = counts.reduce((sum, [, count]) => sum + count, 0);
  const at = (position: number) => {
    let seen = 0;
    for (const [value, count] of counts) {
      seen += count;
      if (position < seen) return value;
    }
    return counts[counts.length - 1]![0];
  };
  if (total === 0) return 0;
  return total % 2 ? at((total - 1) / 2) : (at(total / 2 - 1) + at(total / 2)) / 2;
}

/**
 * One year's players with the rung each had reached on `day`: for the current year the active
 * students (their grade and school now), for an ended year its history rows that did not end
 * withdrawn (their grade and school that year, and the rung dates kept with the row when the
 * year was closed). The rung on a day is the count of the student's rung dates up to it, which
 * `width_bucket` answers by a binary search of the sorted array (PostgreSQL manual, 9.3
 * "Mathematical Functions": width_bucket(operand, thresholds)).
 */
function playersOn(year: ComparedYear, day: string, inScope: (column: SQL) => SQL): SQL {
  return year.current
    ? sql`select a.grade::int as grade, coalesce(width_bucket(${day}::date, a.rung_dates), 0) as rung
        from student_attainment a where a.active and a.grade is not null ${inScope(sql`a.school_id`)}`
    : sql`select sy.grade::int as grade, coalesce(width_bucket(${day}::date, sy.rung_dates), 0) as rung
        from student_years sy
        where sy.school_year_id = ${year.id} and sy.outcome <> 'withdrawn' ${inScope(sql`sy.school_id`)}`;
}

/**
 * Rung by grade: the compared year's students of each grade on a day of that year, against the
 * year before's students of the same grade the same number of days after its first day. The day
 * defaults to today, kept within the compared year; one asked for must fall within it.
 */
export async function rungByGrade(
  db: Database,
  actor: Actor,
  year: ComparedYear,
  previous: ComparedYear | null,
  options: { asOf?: string; schoolId?: number },
): Promise<RungByGrade> {
  if (
    options.asOf !== undefined &&
    (options.asOf < year.starts_on || options.asOf > year.ends_on)
  ) {
    throw badRequest(
      `The day must fall within ${year.name} (${year.starts_on} to ${year.ends_on}).`,
      [{ field: 'asOf', message: `Choose a day from ${year.starts_on} to ${year.ends_on}.` }],
    );
  }
  const asOf = options.asOf ?? clamp(today(), year.starts_on, year.ends_on);
  const day = daysBetween(year.starts_on, asOf);
  const previousAsOf = previous
    ? clamp(addDays(previous.starts_on, day), previous.starts_on, previous.ends_on)
    : null;
  const scope = schoolScope(actor);
  const inScope = (column: SQL) => {
    const parts: SQL[] = [];
    if (scope !== 'all') parts.push(sql`${column} = any(${intArray(scope)}::int[])`);
    if (options.schoolId !== undefined) parts.push(sql`${column} = ${options.schoolId}`);
    return parts.length ? sql` and ${sql.join(parts, sql` and `)}` : sql``;
  };
  const before =
    previous && previousAsOf
      ? sql`union all select 'previous' as side, p.grade, p.rung, count(*)::int as students
          from (${playersOn(previous, previousAsOf, inScope)}) p group by p.grade, p.rung`
      : sql``;
  // Counts by grade and rung, the medians taken from them (rungs are small whole numbers).
  const rows = rowsOf<{
    side: 'current' | 'previous';
    grade: number;
    rung: number;
    students: number;
  }>(
    await db.execute(sql`
      select 'current' as side, c.grade, c.rung, count(*)::int as students
      from (${playersOn(year, asOf, inScope)}) c group by c.grade, c.rung
      ${before}
      order by 2, 3`),
  );
  const counts = new Map<number, { current: [number, number][]; previous: [number, number][] }>();
  for (const row of rows) {
    const grade = counts.get(row.grade) ?? { current: [], previous: [] };
    grade[row.side].push([row.rung, row.students]);
    counts.set(row.grade, grade);
  }
  const summary = (pairs: [number, number][]) => {
    const students = pairs.reduce((sum, [, count]) => sum + count, 0);
    return { median: students ? medianOfCounts(pairs) : null, students };
  };
  return {
    asOf,
    day,
    previousAsOf,
    grades: [...counts]
      .sort(([a], [b]) => a - b)
      .map(([grade, sides]) => ({
        grade,
        current: summary(sides.current),
        previous: summary(sides.previous),
      })),
  };
}
