import { sql } from 'drizzle-orm';
import { rowsOf, type Database } from '../../server/db/client';

const tally = (counts: Map<string, number>, key: string, students: number) =>
  counts.set(key, (counts.get(key) ?? 0) + students);

/**
 * Where the trigger-kept `active_rung_counts` and `active_rung_days` disagree with counting the
 * active summary rows one by one here: an empty list when both are exact.
 */
export async function rungCountDrift(db: Database): Promise<string[]> {
  const rows = rowsOf<{
    school_id: number | null;
    grade: number | null;
    cohort_starts_on: string | null;
    cohort_grade: number | null;
    rung: number;
    rung_dates: string[] | null;
  }>(
    await db.execute(sql`
      select school_id, grade, cohort_starts_on::text as cohort_starts_on, cohort_grade, rung,
        rung_dates::text[] as rung_dates
      from student_attainment where active`),
  );
  const counted = new Map<string, number>();
  for (const row of rows) {
    const dates = row.rung_dates ?? [];
    tally(
      counted,
      `counts|${row.school_id}|${row.grade}|${row.cohort_starts_on}|${row.cohort_grade}|${row.rung}|${dates.length}`,
      1,
    );
    if (row.grade !== null)
      dates.forEach((day, index) =>
        tally(counted, `days|${day}|${row.school_id}|${row.grade}|${index + 1}`, 1),
      );
  }
  const kept = new Map<string, number>();
  for (const row of rowsOf<{ key: string; students: number }>(
    await db.execute(sql`
      select concat_ws('|', 'counts', coalesce(school_id::text, 'null'), coalesce(grade::text, 'null'),
        coalesce(cohort_starts_on::text, 'null'), coalesce(cohort_grade::text, 'null'), rung, dated) as key,
        students
      from active_rung_counts where students <> 0
      union all
      select concat_ws('|', 'days', reached_on::text, coalesce(school_id::text, 'null'), grade, rung),
        students
      from active_rung_days where students <> 0`),
  ))
    tally(kept, row.key, row.students);
  return [...new Set([...counted.keys(), ...kept.keys()])]
    .filter((key) => counted.get(key) !== kept.get(key))
    .map((key) => `${key}: kept ${kept.get(key) ?? 0}, counted ${counted.get(key) ?? 0}`);
}
