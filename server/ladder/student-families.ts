import { sql } from 'drizzle-orm';
import { instruments } from '@shared/music/index';
import { rowsOf } from '../db/client';
import type { Queryable } from './ladder-queries';

const familyOfInstrument = new Map(
  instruments.map((instrument) => [instrument.id, instrument.family]),
);

/** The instrument family of an instrument id; '' when the id is unknown or missing. */
export function familyOf(instrumentId: string | null | undefined): string {
  return (instrumentId && familyOfInstrument.get(instrumentId)) || '';
}

/**
 * Each student's instrument for the ladder: the first active seat of the current school year
 * (or, failing that, of the latest year). Students with no seat are absent from the map.
 */
export async function studentInstruments(
  db: Queryable,
  studentIds?: readonly number[],
): Promise<Map<number, string>> {
  const only = studentIds
    ? sql`and e.student_id = any(${`{${studentIds.join(',')}}`}::int[])`
    : sql``;
  const rows = rowsOf<{ student_id: number; instrument_id: string }>(
    await db.execute(sql`
      select distinct on (e.student_id) e.student_id, e.instrument_id
      from enrollments e
      join school_years y on y.id = e.school_year_id
      where e.active and e.instrument_id is not null ${only}
      order by e.student_id, y.current desc, y.starts_on desc, e.id`),
  );
  return new Map(rows.map((row) => [row.student_id, row.instrument_id]));
}
