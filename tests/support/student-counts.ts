import { sql } from 'drizzle-orm';
import { rowsOf, type Database } from '../../server/db/client';

/**
 * The groups where the trigger-kept `student_counts` disagree with counting the students
 * themselves: an empty list when the counts are exact.
 */
export async function studentCountDrift(db: Database) {
  return rowsOf<{
    school_id: number;
    grade: number;
    status: string;
    kept: number;
    counted: number;
  }>(
    await db.execute(sql`
      select coalesce(k.school_id, r.school_id) as school_id, coalesce(k.grade, r.grade)::int as grade,
        coalesce(k.status, r.status) as status, coalesce(k.students, 0) as kept, coalesce(r.students, 0) as counted
      from (select * from student_counts where students <> 0) k
      full join (select school_id, grade, status, count(*)::int as students from students group by 1, 2, 3) r
        on r.school_id = k.school_id and r.grade = k.grade and r.status = k.status
      where coalesce(k.students, 0) <> coalesce(r.students, 0)`),
  );
}
