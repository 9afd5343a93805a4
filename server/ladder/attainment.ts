import { sql } from 'drizzle-orm';
import { currentRung, metRequirements, type PassOffRecord, type Rung } from '../../shared/ladder/index';
import { rowsOf } from '../db/client';
import { activeRuleLadder, type Queryable } from './ladder-queries';
import { familyOf, studentInstruments } from './student-families';

interface PassOffSummaryRow {
  student_id: number;
  requirement_code: string;
  best_passed_tempo: number | null;
  last_passed_on: string | null;
  last_heard_on: string;
}

interface AttainmentRow {
  student_id: number;
  ladder_version_id: number | null;
  family: string;
  rung: number;
  met_count: number;
  last_passed_on: string | null;
  last_pass_off_on: string | null;
}

const intArray = (ids: readonly number[]) => `{${ids.join(',')}}`;

/**
 * One student's standing from their pass-offs, computed by the ladder rules themselves. The
 * fastest passed tempo per requirement stands in for all its passes: a requirement is met when
 * any pass reaches its tempo, which is when the fastest one does.
 */
function standingOf(
  studentId: number,
  summaries: readonly PassOffSummaryRow[],
  rungs: readonly Rung[],
  family: string,
  versionId: number | null,
): AttainmentRow {
  const records: PassOffRecord[] = [];
  let lastPassedOn: string | null = null;
  let lastPassOffOn: string | null = null;
  for (const summary of summaries) {
    if (summary.best_passed_tempo !== null) {
      records.push({
        requirementId: summary.requirement_code,
        tempo: summary.best_passed_tempo,
        passed: true,
        heardOn: summary.last_passed_on!,
      });
      if (!lastPassedOn || summary.last_passed_on! > lastPassedOn) lastPassedOn = summary.last_passed_on;
    }
    if (!lastPassOffOn || summary.last_heard_on > lastPassOffOn) lastPassOffOn = summary.last_heard_on;
  }
  return {
    student_id: studentId,
    ladder_version_id: versionId,
    family,
    rung: currentRung(rungs, records, family),
    met_count: metRequirements(rungs, records, family).size,
    last_passed_on: lastPassedOn,
    last_pass_off_on: lastPassOffOn,
  };
}

const summaryColumns = sql`
  p.student_id, p.requirement_code,
  max(p.tempo) filter (where p.passed)::int as best_passed_tempo,
  to_char(max(p.heard_on) filter (where p.passed), 'YYYY-MM-DD') as last_passed_on,
  to_char(max(p.heard_on), 'YYYY-MM-DD') as last_heard_on`;

async function writeAttainment(db: Queryable, rows: readonly AttainmentRow[]) {
  for (let start = 0; start < rows.length; start += 10_000) {
    const batch = JSON.stringify(rows.slice(start, start + 10_000));
    await db.execute(sql`
      insert into student_attainment
        (student_id, ladder_version_id, family, rung, met_count, last_passed_on, last_pass_off_on, updated_at)
      select x.student_id, x.ladder_version_id, x.family, x.rung, x.met_count, x.last_passed_on, x.last_pass_off_on, now()
      from json_to_recordset(${batch}::json) as x(
        student_id int, ladder_version_id int, family text, rung smallint, met_count smallint,
        last_passed_on date, last_pass_off_on date)
      on conflict (student_id) do update set
        ladder_version_id = excluded.ladder_version_id, family = excluded.family, rung = excluded.rung,
        met_count = excluded.met_count, last_passed_on = excluded.last_passed_on,
        last_pass_off_on = excluded.last_pass_off_on, updated_at = excluded.updated_at`);
  }
}

function groupByStudent(rows: readonly PassOffSummaryRow[]): Map<number, PassOffSummaryRow[]> {
  const grouped = new Map<number, PassOffSummaryRow[]>();
  for (const row of rows) {
    const list = grouped.get(row.student_id);
    if (list) list.push(row);
    else grouped.set(row.student_id, [row]);
  }
  return grouped;
}

/**
 * Recomputes the summary rows of some students (their rung, met count, last dates, and fastest
 * passes) from their pass-offs against the active ladder. Call it in the transaction that wrote
 * the pass-offs, so the summary never disagrees with them.
 */
export async function recomputeAttainment(db: Queryable, studentIds: readonly number[]): Promise<void> {
  const ids = [...new Set(studentIds)];
  if (ids.length === 0) return;
  const ladder = await activeRuleLadder(db);
  const [summaries, instrumentsByStudent] = await Promise.all([
    db.execute(sql`select ${summaryColumns} from pass_offs p
      where p.student_id = any(${intArray(ids)}::int[]) group by p.student_id, p.requirement_code`),
    studentInstruments(db, ids),
  ]);
  const grouped = groupByStudent(rowsOf<PassOffSummaryRow>(summaries));
  const rows = ids.map((id) =>
    standingOf(id, grouped.get(id) ?? [], ladder?.rungs ?? [], familyOf(instrumentsByStudent.get(id)), ladder?.versionId ?? null),
  );
  await writeAttainment(db, rows);
  await db.execute(sql`delete from passed_requirements where student_id = any(${intArray(ids)}::int[])`);
  await db.execute(sql`
    insert into passed_requirements (student_id, requirement_code, best_tempo, first_passed_on)
    select p.student_id, p.requirement_code, max(p.tempo), min(p.heard_on) from pass_offs p
    where p.passed and p.student_id = any(${intArray(ids)}::int[])
    group by p.student_id, p.requirement_code`);
}

/**
 * Rebuilds every summary table for every student: each student's rung against the active
 * ladder, their fastest passes, and the weekly pass-off counts. The seed calls it once, and
 * publishing a ladder version calls it in the publishing transaction.
 */
export async function rebuildAttainment(db: Queryable): Promise<void> {
  const ladder = await activeRuleLadder(db);
  const [studentRows, summaries, instrumentsByStudent] = await Promise.all([
    db.execute(sql`select id from students`),
    db.execute(sql`select ${summaryColumns} from pass_offs p group by p.student_id, p.requirement_code`),
    studentInstruments(db),
  ]);
  const grouped = groupByStudent(rowsOf<PassOffSummaryRow>(summaries));
  const rows = rowsOf<{ id: number }>(studentRows).map(({ id }) =>
    standingOf(id, grouped.get(id) ?? [], ladder?.rungs ?? [], familyOf(instrumentsByStudent.get(id)), ladder?.versionId ?? null),
  );
  await db.execute(sql`delete from student_attainment`);
  await writeAttainment(db, rows);
  await db.execute(sql`delete from passed_requirements`);
  await db.execute(sql`
    insert into passed_requirements (student_id, requirement_code, best_tempo, first_passed_on)
    select p.student_id, p.requirement_code, max(p.tempo), min(p.heard_on) from pass_offs p
    where p.passed group by p.student_id, p.requirement_code`);
  await db.execute(sql`delete from pass_off_weeks`);
  await db.execute(sql`
    insert into pass_off_weeks (week_start, school_id, grade, heard, passed)
    select date_trunc('week', p.heard_on)::date, p.school_id, p.grade, count(*), count(*) filter (where p.passed)
    from pass_offs p group by 1, 2, 3`);
}

/** A change to the weekly counts: one pass-off added (+1) or taken away (−1). */
export interface WeekCountChange {
  heardOn: string;
  schoolId: number;
  grade: number;
  passed: boolean;
  delta: 1 | -1;
}

/** Keeps `pass_off_weeks` current as pass-offs are written, in the writer's transaction. */
export async function countWeeks(db: Queryable, changes: readonly WeekCountChange[]): Promise<void> {
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
