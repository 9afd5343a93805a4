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
 * A closed year's players with the rung each had reached on `day`: its history rows that did not
 * end withdrawn (their grade and school that year, and the rung dates kept with the row when the
 * year was closed). The rung on a day is the count of the student's rung dates up to it, which
 * `width_bucket` answers by a binary search of the sorted array (PostgreSQL manual, 9.3
 * "Mathematical Functions": width_bucket(operand, thresholds)).
 */
function historyOn(
  year: ComparedYear,
  day: string,
  side: 'current' | 'previous',
  inScope: (column: SQL) => SQL,
) {
  return sql`select ${sql.raw(`'${side}'`)} as side, p.grade, p.rung, count(*)::int as students
    from (select sy.grade::int as grade, coalesce(width_bucket(${day}::date, sy.rung_dates), 0) as rung
      from student_years sy
      where sy.school_year_id = ${year.id} and sy.outcome <> 'withdrawn' ${inScope(sql`sy.school_id`)}) p
    group by p.grade, p.rung`;
}

/**
 * The current year's players (the active students with a grade, at their grade and school now)
 * as counts, not students: 'dated' rows give how many carry each number of rung dates
 * (`active_rung_counts`), 'after' rows how many reached each rung on a day after `day`
 * (`active_rung_days`, read from its key's end). {@link rungsOnDay} turns them into the rung
 * each had reached on the day.
 */
function currentOn(day: string, inScope: (column: SQL) => SQL) {
  return sql`select 'dated' as side, c.grade::int as grade, c.dated::int as rung,
      sum(c.students)::int as students
    from active_rung_counts c where c.grade is not null ${inScope(sql`c.school_id`)}
    group by 2, 3 having sum(c.students) <> 0
    union all
    select 'after', d.grade::int, d.rung::int, sum(d.students)::int
    from active_rung_days d where d.reached_on > ${day}::date ${inScope(sql`d.school_id`)}
    group by 2, 3 having sum(d.students) <> 0`;
}

/**
 * A grade's students by the rung reached on a day, as ascending [rung, students] pairs, from how
 * many carry each number of rung dates (`dated`, [count, students]) and how many reached each
 * rung after the day (`after`, rung → students). A student's rung on the day is their count of
 * rung dates up to it: those reaching rung k by the day are those with at least k dates less
 * those whose k-th date is later.
 */
export function rungsOnDay(
  dated: readonly (readonly [number, number])[],
  after: ReadonlyMap<number, number>,
): [number, number][] {
  const top = dated.reduce((most, [count]) => Math.max(most, count), 0);
  // reached[k]: students with a k-th rung date on or before the day (reached[0]: everyone).
  const reached = Array.from({ length: top + 2 }, () => 0);
  for (const [count, students] of dated)
    for (let k = 0; k <= count; k += 1) reached[k]! += students;
  for (let k = 1; k <= top; k += 1) reached[k]! -= after.get(k) ?? 0;
  const pairs: [number, number][] = [];
  for (let k = 0; k <= top; k += 1) {
    const students = reached[k]! - reached[k + 1]!;
    if (students > 0) pairs.push([k, students]);
  }
  return pairs;
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
      ? sql`union all ${historyOn(previous, previousAsOf, 'previous', inScope)}`
      : sql``;
  // Counts by grade and rung, the medians taken from them (rungs are small whole numbers).
  const rows = rowsOf<{
    side: 'current' | 'previous' | 'dated' | 'after';
    grade: number;
    rung: number;
    students: number;
  }>(
    await db.execute(sql`
      ${year.current ? currentOn(asOf, inScope) : historyOn(year, asOf, 'current', inScope)}
      ${before}
      order by 2, 3`),
  );
  const counts = new Map<number, { current: [number, number][]; previous: [number, number][] }>();
  const dated = new Map<number, [number, number][]>();
  const after = new Map<number, Map<number, number>>();
  for (const row of rows) {
    if (row.side === 'after') {
      after.set(row.grade, (after.get(row.grade) ?? new Map()).set(row.rung, row.students));
      continue;
    }
    const grade = counts.get(row.grade) ?? { current: [], previous: [] };
    counts.set(row.grade, grade);
    if (row.side === 'dated')
      dated.set(row.grade, [...(dated.get(row.grade) ?? []), [row.rung, row.students]]);
    else grade[row.side].push([row.rung, row.students]);
  }
  for (const [grade, pairs] of dated)
    counts.get(grade)!.current = rungsOnDay(pairs, after.get(grade) ?? new Map());
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
