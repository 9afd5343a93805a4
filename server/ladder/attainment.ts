import { sql, type SQL } from 'drizzle-orm';
import { currentRung, metRequirements, type PassOffRecord, type Rung } from '@shared/ladder/index';
import { intArray, rowsOf } from '../db/client';
import { activeRuleLadder, type Queryable } from './ladder-queries';
import { familyOf, studentInstruments } from './student-families';

export { countWeeks, weekChange, type WeekCountChange } from './pass-off-weeks';

interface StandingRow {
  student_id: number;
  ladder_version_id: number | null;
  family: string;
  rung: number;
  met_count: number;
  best_tempos: (number | null)[] | null;
  rung_dates: string[];
}

/**
 * The requirement codes of a ladder in the order of `student_attainment.best_tempos`: sorted by
 * code (as PostgreSQL's "C" collation sorts them, which migration 0012 relies on).
 */
export function bestTempoCodes(rungs: readonly Rung[]): string[] {
  return [
    ...new Set(rungs.flatMap((rung) => rung.requirements.map((requirement) => requirement.id))),
  ].sort();
}

/**
 * The days a student reached each rung, rung 1 first: the ladder rules asked on every day a
 * requirement was first met (the only days the answer can change, since a met requirement stays
 * met), with the pass-offs heard up to that day. A jump of two rungs on one day gives that day
 * twice. `metOn` holds one record per met requirement, dated the first day it was passed at its
 * tempo, which the rules read as they read the whole history up to any day.
 */
export function rungDates(
  rungs: readonly Rung[],
  metOn: readonly PassOffRecord[],
  family: string,
): string[] {
  const days = [...new Set(metOn.map((record) => record.heardOn))].sort();
  // Rungs with no requirement for the family at the foot of the ladder are reached before any
  // pass-off: PostgreSQL's date '-infinity' sorts before every day.
  const dates: string[] = Array.from({ length: currentRung(rungs, [], family) }, () => '-infinity');
  for (const day of days) {
    const rung = currentRung(
      rungs,
      metOn.filter((record) => record.heardOn <= day),
      family,
    );
    while (dates.length < rung) dates.push(day);
  }
  return dates;
}

/**
 * Each student's rung and met count against the active ladder, computed by the ladder rules
 * themselves from `passed_requirements`. The fastest passed tempo per requirement stands in for
 * all its passes: a requirement is met when any pass reaches its tempo, which is when the
 * fastest one does.
 */
async function standings(
  db: Queryable,
  studentIds: readonly number[] | null,
): Promise<StandingRow[]> {
  const only = (column: SQL) =>
    studentIds ? sql`where ${column} = any(${intArray(studentIds)}::int[])` : sql``;
  // One after another: inside a transaction these share one connection, which runs one
  // query at a time (node-postgres deprecates overlapping queries on a client).
  const ladder = await activeRuleLadder(db);
  const passes = await db.execute(sql`
      select r.student_id, string_agg(r.requirement_code || ':' || r.best_tempo, ',') as passes
      from passed_requirements r ${only(sql`r.student_id`)} group by r.student_id`);
  // The first day each requirement of the active ladder was passed at its tempo. The rung at any
  // day comes from these through the rules (rungDates) and is stored with the rung, rather than
  // worked out in SQL at read time: the ladder rule then has one home, and the year-over-year
  // figure reads one array per student (width_bucket) instead of every pass-off.
  const metOn = ladder
    ? await db.execute(sql`
      select m.student_id, string_agg(m.requirement_code || ':' || m.tempo || ':' || m.met_on, ',') as met
      from (select p.student_id, p.requirement_code, q.tempo, min(p.heard_on)::text as met_on
        from pass_offs p
        join ladder_requirements q on q.ladder_version_id = ${ladder.versionId}
          and q.code = p.requirement_code
        where p.passed and p.tempo >= q.tempo ${studentIds ? sql`and p.student_id = any(${intArray(studentIds)}::int[])` : sql``}
        group by p.student_id, p.requirement_code, q.tempo) m
      group by m.student_id`)
    : null;
  const everyone = studentIds ? null : await db.execute(sql`select id from students`);
  const instruments = await studentInstruments(db, studentIds ?? undefined);
  const passesByStudent = new Map(
    rowsOf<{ student_id: number; passes: string }>(passes).map((row) => [
      row.student_id,
      row.passes,
    ]),
  );
  const metByStudent = new Map(
    (metOn ? rowsOf<{ student_id: number; met: string }>(metOn) : []).map((row) => [
      row.student_id,
      row.met,
    ]),
  );
  const ids = studentIds ?? rowsOf<{ id: number }>(everyone).map((row) => row.id);
  const codes = ladder ? bestTempoCodes(ladder.rungs) : [];
  return ids.map((id) => {
    const records: PassOffRecord[] = (passesByStudent.get(id)?.split(',') ?? []).map((pass) => {
      const [code, tempo] = pass.split(':');
      return { requirementId: code!, tempo: Number(tempo), passed: true, heardOn: '' };
    });
    const family = familyOf(instruments.get(id));
    const rungs = ladder?.rungs ?? [];
    const fastest = new Map(records.map((record) => [record.requirementId, record.tempo]));
    return {
      student_id: id,
      ladder_version_id: ladder?.versionId ?? null,
      family,
      rung: currentRung(rungs, records, family),
      met_count: metRequirements(rungs, records, family).size,
      best_tempos: ladder ? codes.map((code) => fastest.get(code) ?? null) : null,
      rung_dates: rungDates(
        rungs,
        (metByStudent.get(id)?.split(',') ?? []).map((met) => {
          const [code, tempo, day] = met.split(':');
          return { requirementId: code!, tempo: Number(tempo), passed: true, heardOn: day! };
        }),
        family,
      ),
    };
  });
}

/** Rebuilds the fastest passes of some students (or everyone) from their pass-offs. */
async function rebuildPassedRequirements(db: Queryable, studentIds: readonly number[] | null) {
  const only = studentIds ? sql`and p.student_id = any(${intArray(studentIds)}::int[])` : sql``;
  if (studentIds) {
    await db.execute(
      sql`delete from passed_requirements where student_id = any(${intArray(studentIds)}::int[])`,
    );
  } else {
    await db.execute(sql`truncate passed_requirements`);
  }
  // In requirement order, so each requirement's passes sit together on disk: the audition-ready
  // list reads one requirement's passes at a time, and reads a third of the pages this way.
  await db.execute(sql`
    insert into passed_requirements (student_id, requirement_code, best_tempo, first_passed_on)
    select p.student_id, p.requirement_code, max(p.tempo), min(p.heard_on) from pass_offs p
    where p.passed ${only} group by p.student_id, p.requirement_code order by 2, 1`);
}

/**
 * Writes the standings, with each student's school, grade and status, and (unless told not to)
 * their last pass-off dates read from the pass-offs.
 */
async function writeStandings(db: Queryable, rows: readonly StandingRow[], dates: boolean) {
  for (let start = 0; start < rows.length; start += 10_000) {
    const batch = rows.slice(start, start + 10_000);
    const ids = intArray(batch.map((row) => row.student_id));
    const lastDates = dates
      ? sql`(select p.student_id, max(p.heard_on) filter (where p.passed) as last_passed_on, max(p.heard_on) as last_pass_off_on
          from pass_offs p where p.student_id = any(${ids}::int[]) group by p.student_id)`
      : sql`(select a.student_id, a.last_passed_on, a.last_pass_off_on from student_attainment a where a.student_id = any(${ids}::int[]))`;
    await db.execute(sql`
      insert into student_attainment
        (student_id, school_id, grade, active, stale, ladder_version_id, family, rung, met_count,
         best_tempos, rung_dates, last_passed_on, last_pass_off_on, updated_at)
      select x.student_id, s.school_id, s.grade, s.status = 'active', false, x.ladder_version_id, x.family,
        x.rung, x.met_count, x.best_tempos, x.rung_dates, d.last_passed_on, d.last_pass_off_on, now()
      from json_to_recordset(${JSON.stringify(batch)}::json) as x(
        student_id int, ladder_version_id int, family text, rung smallint, met_count smallint,
        best_tempos smallint[], rung_dates date[])
      join students s on s.id = x.student_id
      left join ${lastDates} d on d.student_id = x.student_id
      order by x.student_id
      on conflict (student_id) do update set
        school_id = excluded.school_id, grade = excluded.grade, active = excluded.active, stale = false,
        ladder_version_id = excluded.ladder_version_id, family = excluded.family, rung = excluded.rung,
        met_count = excluded.met_count, best_tempos = excluded.best_tempos,
        rung_dates = excluded.rung_dates,
        last_passed_on = excluded.last_passed_on,
        last_pass_off_on = excluded.last_pass_off_on, updated_at = excluded.updated_at`);
  }
}

/**
 * Recomputes the summary rows of some students (their rung, met count, last dates, and fastest
 * passes) from their pass-offs against the active ladder. Call it in the transaction that wrote
 * the pass-offs, so the summary never disagrees with them.
 */
export async function recomputeAttainment(
  db: Queryable,
  studentIds: readonly number[],
): Promise<void> {
  const ids = [...new Set(studentIds)];
  if (ids.length === 0) return;
  await rebuildPassedRequirements(db, ids);
  await writeStandings(db, await standings(db, ids), true);
}

/**
 * Rebuilds the summary tables for every student. From the pass-offs (the default; the seed
 * uses it): the fastest passes, the weekly counts, every rung and the last dates. After a
 * ladder is published (`{ from: 'summaries' }`): only the rungs, since the fastest passes and
 * the dates do not depend on the ladder.
 */
export async function rebuildAttainment(
  db: Queryable,
  options: { from: 'pass-offs' | 'summaries' } = { from: 'pass-offs' },
): Promise<void> {
  const fromPassOffs = options.from === 'pass-offs';
  if (fromPassOffs) {
    await rebuildPassedRequirements(db, null);
    await db.execute(sql`truncate pass_off_weeks`);
    await db.execute(sql`
      insert into pass_off_weeks (week_start, school_id, grade, heard, passed)
      select date_trunc('week', p.heard_on)::date, p.school_id, p.grade, count(*), count(*) filter (where p.passed)
      from pass_offs p group by 1, 2, 3`);
  }
  await writeStandings(db, await standings(db, null), fromPassOffs);
}
