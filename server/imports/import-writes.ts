import type { DatabaseHandle } from '../db/client';
import type { RosterRow } from '@shared/roster';
import { guessEnsembleKind } from './ensemble-kind';
import { createJournal } from './import-journal';
import { firstRowOfEachStudent, writtenStudentColumns, type ImportPlan } from './import-plan';
import { rosterGeneration } from './roster-snapshot';
import { queryJson, type SqlSession, type StagedValue } from './sql-session';

/*
 * The statements of an import's transaction: its rows staged in temporary tables, then written
 * set by set (INSERT … SELECT, UPDATE … FROM) so that only rows that differ are touched.
 */

const stagedStudentColumns = [
  'student_number',
  'first_name',
  'last_name',
  'preferred_name',
  'grade',
  'school_id',
  'guardian_name',
  'guardian_email',
] as const;

export async function createStagingTables(session: SqlSession) {
  await session.query(`create temp table import_students (
    student_number text not null, first_name text not null, last_name text not null,
    preferred_name text, grade smallint not null, school_id integer not null,
    guardian_name text, guardian_email text) on commit drop`);
  await session.query(`create temp table import_seats (
    student_number text not null, ensemble_id integer not null, instrument_id text,
    new_student boolean not null) on commit drop`);
  await session.query(
    `create temp table import_listed (student_number text not null) on commit drop`,
  );
  await createJournal(session);
}

/** Creates the ensembles the file names that its schools lack; answers school → name → id. */
export async function ensureEnsembles(
  session: SqlSession,
  plan: ImportPlan,
  schoolIdByCode: Map<string, number>,
) {
  const schoolIds = [...new Set(plan.schoolCodes.map((code) => schoolIdByCode.get(code)!))];
  const rows = await session.query<{ id: number; school_id: number; name: string }>(
    'select id, school_id, name from ensembles where school_id = any($1::int[]) order by id',
    [schoolIds],
  );
  const byKey = new Map<string, number>();
  const keyOf = (schoolId: number, name: string) => `${schoolId}\u0000${name.toLowerCase()}`;
  for (const row of rows)
    if (!byKey.has(keyOf(row.school_id, row.name)))
      byKey.set(keyOf(row.school_id, row.name), row.id);
  const missing = new Map<string, { schoolId: number; name: string }>();
  for (const { row } of plan.parsed.rows) {
    if (!row.ensemble) continue;
    const schoolId = schoolIdByCode.get(row.schoolCode)!;
    const key = keyOf(schoolId, row.ensemble);
    if (!byKey.has(key) && !missing.has(key)) missing.set(key, { schoolId, name: row.ensemble });
  }
  const created: { id: number; school_id: number; name: string }[] = [];
  if (missing.size > 0) {
    const list = [...missing.values()];
    created.push(
      ...(await session.query<{ id: number; school_id: number; name: string }>(
        `insert into ensembles (school_id, name, kind)
         select * from unnest($1::int[], $2::text[], $3::text[])
         returning id, school_id, name`,
        [
          list.map((entry) => entry.schoolId),
          list.map((entry) => entry.name),
          list.map((entry) => guessEnsembleKind(entry.name)),
        ],
      )),
    );
    for (const row of created) byKey.set(keyOf(row.school_id, row.name), row.id);
  }
  return {
    ensembleId: (schoolId: number, name: string) => byKey.get(keyOf(schoolId, name))!,
    created,
  };
}

/**
 * Whether this transaction may write only what the plan found different from the database.
 * In PGlite, where transactions run one at a time, that holds when the roster generation
 * (migration 0013) is where the plan's reads saw it: nothing the plan compared was written
 * since. On a PostgreSQL server the sequence moves before a concurrent writer commits, so a
 * plan could miss a change that lands after its reads; there every row is compared again.
 */
export async function planStillHolds(
  database: DatabaseHandle,
  session: SqlSession,
  generation: string | null,
): Promise<boolean> {
  if (database.kind !== 'pglite' || generation === null) return false;
  return (await rosterGeneration((text) => session.query(text))) === generation;
}

/** A student's row as staged: the columns of {@link stagedStudentColumns}. */
function stagedStudent(row: RosterRow, schoolIdByCode: Map<string, number>): StagedValue[] {
  return [
    row.studentId,
    row.firstName,
    row.lastName,
    row.preferredName ?? null,
    row.grade,
    schoolIdByCode.get(row.schoolCode)!,
    row.guardianName ?? null,
    row.guardianEmail ?? null,
  ];
}

/** The students to write as staged rows, split by whether they exist (see {@link studentRows}). */
export interface StagedStudents {
  existing: StagedValue[][];
  fresh: StagedValue[][];
}

/**
 * The students to write as staged rows (the first row of each), split by whether they exist:
 * every student of the file, or only those the plan found different when it still holds.
 */
export async function studentRows(
  session: SqlSession,
  plan: ImportPlan,
  schoolIdByCode: Map<string, number>,
  onlyDifferences: boolean,
): Promise<StagedStudents> {
  const students = firstRowOfEachStudent(plan.parsed).filter(
    (row) => !onlyDifferences || plan.differences.students.has(row.studentId),
  );
  const rows = students.map((row) => stagedStudent(row, schoolIdByCode));
  // Read inside the transaction (the plan was made before it): one index probe per student.
  const [found] = await session.query<{ numbers: string[] | null }>(
    `select array_agg(student_number) as numbers from students where student_number = any($1::text[])`,
    [rows.map((row) => row[0])],
  );
  const known = new Set(found?.numbers ?? []);
  const existing: StagedValue[][] = [];
  const fresh: StagedValue[][] = [];
  for (const row of rows) (known.has(row[0] as string) ? existing : fresh).push(row);
  return { existing, fresh };
}

/** Stages the existing students, every seat to write, and (to withdraw the rest) who is listed. */
export async function stage(
  session: SqlSession,
  plan: ImportPlan,
  students: StagedStudents,
  schoolIdByCode: Map<string, number>,
  ensembleId: (schoolId: number, name: string) => number,
  onlyDifferences: boolean,
) {
  const fresh = new Set(students.fresh.map((row) => row[0] as string));
  const seats: StagedValue[][] = [];
  for (const [index, { row }] of plan.parsed.rows.entries()) {
    if (!row.ensemble) continue;
    if (onlyDifferences && !plan.differences.seatRows.has(index)) continue;
    seats.push([
      row.studentId,
      ensembleId(schoolIdByCode.get(row.schoolCode)!, row.ensemble),
      row.instrument ?? null,
      fresh.has(row.studentId) ? 't' : 'f',
    ]);
  }
  await session.load('import_students', stagedStudentColumns, students.existing);
  await session.load(
    'import_seats',
    ['student_number', 'ensemble_id', 'instrument_id', 'new_student'],
    seats,
  );
  if (plan.options.withdrawMissing) {
    const listed = new Set(plan.options.listedStudentIds ?? []);
    for (const { row } of plan.parsed.rows) listed.add(row.studentId);
    await session.load(
      'import_listed',
      ['student_number'],
      [...listed].map((number) => [number]),
    );
  }
}

/**
 * Updates students whose columns differ, with one audit entry each; a student who changes school
 * gets a school move and leaves the old school's ensembles for the year. Answers their ids.
 */
export async function updateStudents(
  session: SqlSession,
  plan: ImportPlan,
  userId: number | null,
  schoolYearId: number | null,
) {
  const columns = writtenStudentColumns(plan.parsed.mapping).map((entry) => entry.column);
  const assignments = columns.map((column) => `${column} = i.${column}`).join(', ');
  const current = columns.map((column) => `s.${column}`).join(', ');
  const incoming = columns.map((column) => `i.${column}`).join(', ');
  const numbers = await queryJson<string>(
    session,
    `with prior as (
       select s.* from students s join import_students i on i.student_number = s.student_number
       where (${current}, s.status) is distinct from (${incoming}, 'active')
     ), changed as (
       update students s set ${assignments}, status = 'active', version = s.version + 1, updated_at = now()
       from prior p join import_students i on i.student_number = p.student_number
       where s.id = p.id
       returning s.*
     ), moved as (
       insert into school_moves (student_id, from_school_id, to_school_id, moved_by)
       select p.id, p.school_id, c.school_id, $1::int from prior p join changed c on c.id = p.id
       where p.school_id <> c.school_id
     ), unseated as (
       update enrollments en set active = false, version = en.version + 1, updated_at = now()
       from prior p join changed c on c.id = p.id, ensembles e
       where p.school_id <> c.school_id and en.student_id = c.id and e.id = en.ensemble_id
         and e.school_id = p.school_id and en.school_year_id = $2::int and en.active
       returning en.id, en.student_id, en.ensemble_id, en.version
     ), journaled as (
       insert into import_journal (kind, student_id, enrollment_id, ensemble_id, before, version_after)
       select 'student-updated', c.id, null, null, to_jsonb(p), c.version from changed c join prior p on p.id = c.id
       union all
       select 'seat-ended', student_id, id, ensemble_id, jsonb_build_object('active', true), version from unseated
     )
     , audited as (
       insert into audit_log (user_id, action, entity, entity_id, before, after)
       select $1::int, 'update', 'student', c.id::text, to_jsonb(p), to_jsonb(c)
       from changed c join prior p on p.id = c.id
     )
     select json_agg(student_number)::text as json from changed`,
    [userId, schoolYearId],
  );
  return new Set(numbers);
}

/**
 * Adds the students no row of `students` has yet, loading them straight into the table (COPY in
 * PGlite writes rows in batches, several times faster than INSERT … SELECT from a staging table);
 * the unique student number still refuses a student added since the existence check.
 */
export async function insertStudents(session: SqlSession, fresh: StagedValue[][]) {
  await session.load('students', stagedStudentColumns, fresh);
  return new Set(fresh.map((row) => row[0] as string));
}

/**
 * Seats each row's student in its ensemble for the year; answers the seats that changed. A new
 * student has no seats yet, so theirs are plain inserts; the rest may meet a seat already held.
 */
export async function seatStudents(session: SqlSession, schoolYearId: number) {
  const seats = await queryJson<string>(
    session,
    `with prior_seats as (
       select en.id, en.instrument_id, en.active from enrollments en
       join students s on s.id = en.student_id
       join import_seats a on a.student_number = s.student_number and a.ensemble_id = en.ensemble_id
       where not a.new_student and en.school_year_id = $1::int
     ), seated_new as (
       insert into enrollments (student_id, ensemble_id, school_year_id, instrument_id)
       select s.id, a.ensemble_id, $1::int, a.instrument_id
       from import_seats a join students s on s.student_number = a.student_number
       where a.new_student
       returning student_id, ensemble_id
     ), seated as (
       insert into enrollments (student_id, ensemble_id, school_year_id, instrument_id)
       select s.id, a.ensemble_id, $1::int, a.instrument_id
       from import_seats a join students s on s.student_number = a.student_number
       where not a.new_student
       on conflict (student_id, ensemble_id, school_year_id) do update
         set instrument_id = coalesce(excluded.instrument_id, enrollments.instrument_id), active = true,
           version = enrollments.version + 1, updated_at = now()
         where (enrollments.instrument_id, enrollments.active)
           is distinct from (coalesce(excluded.instrument_id, enrollments.instrument_id), true)
       returning id, student_id, ensemble_id, version
     ), journaled as (
       insert into import_journal (kind, student_id, enrollment_id, ensemble_id, before, version_after)
       select case when p.id is null then 'seat-added' else 'seat-changed' end, seated.student_id,
         seated.id, seated.ensemble_id,
         case when p.id is null then null
           else jsonb_build_object('instrument_id', p.instrument_id, 'active', p.active) end,
         seated.version
       from seated left join prior_seats p on p.id = seated.id
     ), changed as (
       select student_id, ensemble_id from seated_new union all select student_id, ensemble_id from seated
     )
     select json_agg(s.student_number || ' ' || changed.ensemble_id)::text as json
     from changed join students s on s.id = changed.student_id`,
    [schoolYearId],
  );
  return new Set(seats);
}

/** Withdraws active students of the file's schools the file does not list; answers how many. */
export async function withdrawMissing(
  session: SqlSession,
  schoolIds: number[],
  schoolYearId: number | null,
  userId: number | null,
) {
  return withdrawStudents(
    session,
    `s.school_id = any($2::int[])
         and not exists (select 1 from import_listed l where l.student_number = s.student_number)`,
    schoolIds,
    schoolYearId,
    userId,
  );
}

/**
 * Withdraws the active students that `which` picks (a condition on `students s`, with `$2` the
 * list it takes) and ends their seats of the year, each with a journal row (so undoing the import
 * makes them active again) and an audit entry; answers how many students were withdrawn.
 */
export async function withdrawStudents(
  session: SqlSession,
  which: string,
  list: unknown[],
  schoolYearId: number | null,
  userId: number | null,
): Promise<number> {
  const [row] = await session.query<{ count: number }>(
    `with gone as (
       update students s set status = 'withdrawn', version = s.version + 1, updated_at = now()
       where ${which} and s.status = 'active'
       returning s.id, s.student_number, s.version
     ), unseated as (
       update enrollments en set active = false, version = en.version + 1, updated_at = now()
       from gone where en.student_id = gone.id and en.school_year_id = $3::int and en.active
       returning en.id, en.student_id, en.ensemble_id, en.version
     ), journaled as (
       insert into import_journal (kind, student_id, enrollment_id, ensemble_id, before, version_after)
       select 'student-withdrawn', id, null, null, jsonb_build_object('status', 'active'), version from gone
       union all
       select 'seat-ended', student_id, id, ensemble_id, jsonb_build_object('active', true), version from unseated
     ), audited as (
       insert into audit_log (user_id, action, entity, entity_id, before, after)
       select $1::int, 'withdraw', 'student', gone.id::text, jsonb_build_object('status', 'active'),
         jsonb_build_object('status', 'withdrawn', 'student_number', gone.student_number)
       from gone
     )
     select count(*)::int as count from gone`,
    [userId, list, schoolYearId],
  );
  return row!.count;
}

/** The district's school ids by code, and the current school year, read in the transaction. */
export async function schoolsAndYear(session: SqlSession) {
  const schools = await session.query<{ id: number; code: string }>('select id, code from schools');
  const [year] = await session.query<{ id: number }>(
    'select id from school_years where current order by starts_on desc limit 1',
  );
  return {
    schoolIdByCode: new Map(schools.map((school) => [school.code, school.id])),
    year: year as { id: number } | undefined,
  };
}
