import { sql } from 'drizzle-orm';
import type { Queryable } from './ladder-queries';

/** A change to the weekly counts: one pass-off added (+1) or taken away (−1). */
export interface WeekCountChange {
  heardOn: string;
  schoolId: number;
  grade: number;
  passed: boolean;
  delta: 1 | -1;
}

/** The change a pass-off row (or the row before an edit) makes to its week's counts. */
export function weekChange(
  passOff: Omit<WeekCountChange, 'delta'>,
  delta: WeekCountChange['delta'],
): WeekCountChange {
  const { heardOn, schoolId, grade, passed } = passOff;
  return { heardOn, schoolId, grade, passed, delta };
}

/** Keeps `pass_off_weeks` current as pass-offs are written, in the writer's transaction. */
export async function countWeeks(
  db: Queryable,
  changes: readonly WeekCountChange[],
): Promise<void> {
  if (changes.length === 0) return;
  const payload = JSON.stringify(
    changes.map((change) => ({
      heard_on: change.heardOn,
      school_id: change.schoolId,
      grade: change.grade,
      passed: change.passed,
      delta: change.delta,
    })),
  );
  await db.execute(sql`
    insert into pass_off_weeks (week_start, school_id, grade, heard, passed)
    select date_trunc('week', x.heard_on)::date, x.school_id, x.grade, sum(x.delta),
      sum(case when x.passed then x.delta else 0 end)
    from json_to_recordset(${payload}::json) as x(heard_on date, school_id int, grade smallint, passed boolean, delta int)
    group by 1, 2, 3
    on conflict (week_start, school_id, grade) do update set
      heard = pass_off_weeks.heard + excluded.heard, passed = pass_off_weeks.passed + excluded.passed`);
}
