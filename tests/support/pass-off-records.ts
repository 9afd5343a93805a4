import { sql } from 'drizzle-orm';
import type { PassOffRecord } from '@shared/ladder/index';
import { rowsOf, type Database } from '../../server/db/client';

/**
 * Every student's raw pass-offs as the ladder rules take them, read straight from the table (the
 * plain figure the trigger-kept summaries are checked against); only those heard on or before
 * `upTo` when it is given.
 */
export async function passOffsByStudent(
  db: Database,
  upTo?: string,
): Promise<Map<number, PassOffRecord[]>> {
  const rows = rowsOf<{
    student_id: number;
    requirement_code: string;
    tempo: number;
    passed: boolean;
    heard_on: string;
  }>(
    await db.execute(sql`
      select student_id, requirement_code, tempo, passed, heard_on::text as heard_on
      from pass_offs where ${upTo ?? null}::date is null or heard_on <= ${upTo ?? null}::date`),
  );
  const byStudent = new Map<number, PassOffRecord[]>();
  for (const row of rows) {
    const records = byStudent.get(row.student_id) ?? [];
    records.push({
      requirementId: row.requirement_code,
      tempo: row.tempo,
      passed: row.passed,
      heardOn: row.heard_on,
    });
    byStudent.set(row.student_id, records);
  }
  return byStudent;
}
