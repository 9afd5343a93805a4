import type { ImportResult } from '../../shared/api/import';
import type { Actor } from '../core/policy';
import { sql } from 'drizzle-orm';
import { afterAnswering, rowsOf, yieldToRequests, type DatabaseHandle } from '../db/client';
import { randomUUID } from 'node:crypto';
import type { RosterRow } from '../../shared/roster';
import { refreshStatistics, rosterTables, statisticsStale } from '../db/statistics';
import { guessEnsembleKind } from './ensemble-kind';
import {
  firstRowOfEachStudent,
  uncommittedResult,
  writtenStudentColumns,
  type ImportPlan,
} from './import-plan';
import { applyDeltaRemovals } from './delta-removals';
import { createJournal, endLeftSeats, journalCreated, saveJournal } from './import-journal';
import { takeBackLanded } from './landed-students';
import { rosterGeneration } from './roster-snapshot';
import { inSqlTransaction, queryJson, type SqlSession, type StagedValue } from './sql-session';

/** Where an import came from, for its history row. */
export interface ImportMeta {
  fileName: string;
  via: 'wizard' | 'cli' | 'api';
}

/** What {@link commitImport} answers: the import's result and its history row. */
export type CommittedImport = ImportResult & { importId: number };

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

async function createStagingTables(session: SqlSession) {
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

const writtenTables = [
  'students',
  'enrollments',
  'ensembles',
  'school_moves',
  'audit_log',
  'roster_imports',
  'roster_import_landings',
  'roster_import_changes',
];

/**
 * In PGlite, where this transaction is the only one running, skips the per-row foreign-key
 * triggers for the rest of the transaction (PostgreSQL's `session_replication_role = replica`
 * fires no ordinary trigger): every school, ensemble, year and student id written was read in
 * this same transaction, and the per-row checks would otherwise cost more than the writes. Our
 * own triggers are enabled ALWAYS (migration 0007), so they still fire; a table with any other
 * trigger keeps the checks on.
 */
async function skipReferenceTriggers(session: SqlSession) {
  const [own] = await session.query<{ count: number }>(
    `select count(*)::int as count from pg_trigger
     where not tgisinternal and tgenabled <> 'A'
       and tgrelid = any(array[${writtenTables.map((name) => `'${name}'::regclass`).join(', ')}])`,
  );
  if (own!.count === 0) await session.query(`set local session_replication_role = replica`);
}

/** Creates the ensembles the file names that its schools lack; answers school → name → id. */
async function ensureEnsembles(
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
async function planStillHolds(
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

/**
 * The students to write as staged rows (the first row of each), split by whether they exist:
 * every student of the file, or only those the plan found different when it still holds.
 */
async function studentRows(
  session: SqlSession,
  plan: ImportPlan,
  schoolIdByCode: Map<string, number>,
  onlyDifferences: boolean,
  landed: Landed,
): Promise<{ existing: StagedValue[][]; fresh: StagedValue[][] }> {
  const students = firstRowOfEachStudent(plan.parsed).filter(
    (row) =>
      !landed.students.has(row.studentId) &&
      (!onlyDifferences || plan.differences.students.has(row.studentId)),
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

async function stage(
  session: SqlSession,
  plan: ImportPlan,
  students: { existing: StagedValue[][]; fresh: StagedValue[][] },
  schoolIdByCode: Map<string, number>,
  ensembleId: (schoolId: number, name: string) => number,
  onlyDifferences: boolean,
  landed: Landed,
) {
  const fresh = new Set([...students.fresh.map((row) => row[0] as string), ...landed.students]);
  const seats: StagedValue[][] = [];
  for (const [index, { row }] of plan.parsed.rows.entries()) {
    if (!row.ensemble || landed.seatRows.has(index)) continue;
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
async function updateStudents(
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
async function insertStudents(session: SqlSession, fresh: StagedValue[][]) {
  await session.load('students', stagedStudentColumns, fresh);
  return new Set(fresh.map((row) => row[0] as string));
}

/**
 * The tables whose secondary indexes a bulk load (see {@link loadsInBulk}) drops before the new
 * students go in and builds again once their seats are in: each new student adds rows to all
 * three.
 */
const bulkLoadedTables = ['students', 'student_attainment', 'enrollments'];

/**
 * Drops the indexes of {@link bulkLoadedTables} that enforce nothing (not unique, no
 * constraint's) and answers the statements that create them again, read from the catalog so
 * a later migration's indexes are included. Transactional: a rollback brings them back.
 */
async function dropSecondaryIndexes(session: SqlSession): Promise<string[]> {
  const indexes = await session.query<{ name: string; definition: string }>(
    `select quote_ident(c.relname) as name, pg_get_indexdef(i.indexrelid) as definition
     from pg_index i join pg_class c on c.oid = i.indexrelid
     where i.indrelid = any($1::regclass[]) and not i.indisunique
       and not exists (select 1 from pg_constraint k where k.conindid = i.indexrelid)
     order by c.relname`,
    [bulkLoadedTables],
  );
  for (const { name } of indexes) await session.query(`drop index ${name}`);
  return indexes.map((index) => index.definition);
}

/** New students below which an import never loads in bulk (one landing slice's worth). */
const bulkLoadAtLeast = 2_000;

/**
 * Whether an import adds at least {@link bulkLoadAtLeast} new students and at least four times
 * as many as the roster already holds (a district's first import, or one that dwarfs the
 * roster): then, in PGlite, its new students go in with one COPY, and their seats, while the
 * secondary indexes of {@link bulkLoadedTables} are dropped, and the indexes are built again
 * after, all in the final transaction. PostgreSQL's manual advises this for bulk loads (14.4.3 "Remove
 * Indexes"): building an index over all the rows at once is cheaper than adding rows to it one
 * at a time, but the build reads the rows already there too. Measured here: 18,000 new students
 * into a fresh district took ~0.8 s to COPY with every index, ~0.3 s without them plus ~0.35 s
 * to build them; 20,000 into a roster of 50,000, 0.5 s with the indexes against 1.3 s to build
 * them again, so the build pays only when the new rows far outnumber the old. Such an import
 * holds the engine for its whole write (about a second for 20,000 rows) instead of landing in
 * slices, so pages asked for meanwhile wait; the roster it adds to is small. On a PostgreSQL
 * server dropping an index would lock the table for everyone, so the import keeps its indexes.
 */
async function loadsInBulk(database: DatabaseHandle, plan: ImportPlan): Promise<boolean> {
  const created = plan.createdStudents.length;
  if (database.kind !== 'pglite' || !plan.canCommit || created < bulkLoadAtLeast) return false;
  const [roster] = rowsOf<{ students: number }>(
    await database.db.execute(
      sql`select coalesce(sum(students), 0)::int as students from student_counts`,
    ),
  );
  return created >= 4 * roster!.students;
}

/**
 * Seats each row's student in its ensemble for the year; answers the seats that changed. A new
 * student has no seats yet, so theirs are plain inserts; the rest may meet a seat already held.
 */
async function seatStudents(session: SqlSession, schoolYearId: number) {
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
async function withdrawMissing(
  session: SqlSession,
  schoolIds: number[],
  schoolYearId: number | null,
  userId: number | null,
) {
  const [row] = await session.query<{ count: number }>(
    `with gone as (
       update students s set status = 'withdrawn', version = s.version + 1, updated_at = now()
       where s.school_id = any($2::int[]) and s.status = 'active'
         and not exists (select 1 from import_listed l where l.student_number = s.student_number)
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
     )
     , audited as (
       insert into audit_log (user_id, action, entity, entity_id, before, after)
       select $1::int, 'withdraw', 'student', gone.id::text, jsonb_build_object('status', 'active'),
         jsonb_build_object('status', 'withdrawn', 'student_number', gone.student_number)
       from gone
     )
     select count(*)::int as count from gone`,
    [userId, schoolIds, schoolYearId],
  );
  return row!.count;
}

async function recordHistory(
  session: SqlSession,
  plan: ImportPlan,
  result: ImportResult,
  userId: number | null,
  meta: ImportMeta,
) {
  const [row] = await session.query<{ id: number }>(
    `insert into roster_imports (user_id, file_name, source, via, committed, rows, created, updated, unchanged, withdrawn, errors)
     values ($1::int, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11::jsonb) returning id`,
    [
      userId,
      meta.fileName,
      plan.parsed.source,
      meta.via,
      result.committed,
      result.rows,
      result.created,
      result.updated,
      result.unchanged,
      result.withdrawn,
      JSON.stringify(result.errors),
    ],
  );
  return row!.id;
}

/** The district's school ids by code, and the current school year, read in the transaction. */
async function schoolsAndYear(session: SqlSession) {
  const schools = await session.query<{ id: number; code: string }>('select id, code from schools');
  const [year] = await session.query<{ id: number }>(
    'select id from school_years where current order by starts_on desc limit 1',
  );
  return {
    schoolIdByCode: new Map(schools.map((school) => [school.code, school.id])),
    year: year as { id: number } | undefined,
  };
}

/** What an import added ahead of its final transaction (see {@link landNewStudents}). */
interface Landed {
  run: string;
  /** Their student ids. */
  students: Set<string>;
  /** Indexes into `parsed.rows` of the rows whose seats were added with them. */
  seatRows: Set<number>;
  /** The names of the ensembles created with the first slice. */
  ensembles: string[];
  /** The roster generation after the last slice: the plan still holds while it is there. */
  generation: string | null;
}

/**
 * New students added per transaction ahead of the final one. Measured on a 50,000-student
 * district: 18,000 new students in one transaction held the embedded engine ~2.5 s, so grid
 * pages waited that long; a slice of 2,000 holds it about a tenth of that.
 */
export const landingSlice = 2_000;

/**
 * In PGlite, when the plan still holds and adds at least a slice of new students, adds them
 * (noting each slice in `landed`, which the caller takes back out if anything fails)
 * with their seats a slice per transaction (the file's new ensembles with the first), so pages
 * answer between slices; the final transaction then writes the rest. Each slice is recorded in
 * `roster_import_landings`, which the final transaction clears: a failure takes the slices
 * back out at once, a crash at the next start (landed-students.ts). Readers may see new
 * students arrive during those seconds. Stops landing, and leaves the rest to the final
 * transaction, when anything else writes the roster between two slices.
 */
async function landNewStudents(
  database: DatabaseHandle,
  plan: ImportPlan,
  landed: Landed,
): Promise<void> {
  const created = new Set(plan.createdStudents.map((student) => student.studentId));
  if (database.kind !== 'pglite' || !plan.canCommit || created.size < landingSlice) return;
  const newStudents = firstRowOfEachStudent(plan.parsed).filter((row) =>
    created.has(row.studentId),
  );
  // The rows (seats) of each new student, found once for every slice.
  const rowsOfStudent = new Map<string, number[]>();
  for (const [index, { row }] of plan.parsed.rows.entries())
    if (row.ensemble && created.has(row.studentId))
      rowsOfStudent.set(row.studentId, [...(rowsOfStudent.get(row.studentId) ?? []), index]);
  for (let from = 0; from < newStudents.length; from += landingSlice) {
    const slice = newStudents.slice(from, from + landingSlice);
    const expected = landed.generation;
    const done = await inSqlTransaction(database, async (session) => {
      if (!(await planStillHolds(database, session, expected))) return null;
      const { schoolIdByCode, year } = await schoolsAndYear(session);
      // The file's new ensembles come with the first slice, so its seats can too.
      const ensembles = await ensureEnsembles(session, plan, schoolIdByCode);
      await skipReferenceTriggers(session);
      await session.load(
        'students',
        stagedStudentColumns,
        slice.map((row) => stagedStudent(row, schoolIdByCode)),
      );
      // Their ids by one index probe each, recorded as landed in the same statement.
      const ids = await session.query<{ id: number; student_number: string }>(
        `with landed as (
           select id, student_number from students where student_number = any($2::text[])
         ), recorded as (
           insert into roster_import_landings (run, student_id) select $1::text, id from landed
         )
         select id, student_number from landed`,
        [landed.run, slice.map((row) => row.studentId)],
      );
      if (ensembles.created.length > 0)
        await session.query(
          `insert into roster_import_landings (run, ensemble_id)
           select $1::text, unnest($2::int[])`,
          [landed.run, ensembles.created.map((row) => row.id)],
        );
      // Their seats straight from arrays: a join of a staged table with every student cost
      // about as much as the seats themselves, once per slice.
      const seatRows = year ? ids.flatMap((id) => rowsOfStudent.get(id.student_number) ?? []) : [];
      if (year && seatRows.length > 0) {
        const idOf = new Map(ids.map((row) => [row.student_number, row.id]));
        const rows = seatRows.map((index) => plan.parsed.rows[index]!.row);
        await session.query(
          `insert into enrollments (student_id, ensemble_id, school_year_id, instrument_id)
           select student, ensemble, $4::int, instrument
           from unnest($1::int[], $2::int[], $3::text[]) as seat (student, ensemble, instrument)`,
          [
            rows.map((row) => idOf.get(row.studentId)!),
            rows.map((row) =>
              ensembles.ensembleId(schoolIdByCode.get(row.schoolCode)!, row.ensemble!),
            ),
            rows.map((row) => row.instrument ?? null),
            year.id,
          ],
        );
      }
      return {
        seatRows,
        ensembles: ensembles.created.map((row) => row.name),
        generation: await rosterGeneration((text) => session.query(text)),
      };
    });
    if (!done) {
      landed.generation = null;
      return;
    }
    for (const row of slice) landed.students.add(row.studentId);
    for (const index of done.seatRows) landed.seatRows.add(index);
    landed.ensembles.push(...done.ensembles);
    landed.generation = done.generation;
    await yieldToRequests();
  }
}

/**
 * Carries out a plan in one final transaction (after any landing slices of a large import, see
 * {@link landNewStudents}), set-based: new students are loaded straight into
 * `students`, the rest of the rows are staged in temporary tables (COPY in PGlite, multi-row
 * INSERTs on a server), then ensembles, students, seats and withdrawals are written with a
 * handful of INSERT … SELECT and UPDATE … FROM statements that touch only rows that differ.
 * The counts come from what the statements did, so a file imported twice reports every row
 * unchanged the second time. When nothing the plan read has been written since (see
 * {@link planStillHolds}), only the students and seats the plan found different are staged, so
 * a nightly file of 20,000 rows with a few hundred changes holds the database for a fraction
 * of the time. A plan that cannot commit (errors without skip-invalid) writes only its history
 * row. Also writes one summarising audit entry, plus one per updated or withdrawn
 * student.
 */
export async function commitImport(
  database: DatabaseHandle,
  plan: ImportPlan,
  actor: Actor | null,
  meta: ImportMeta,
): Promise<CommittedImport> {
  const userId = actor?.userId ?? null;
  const landed: Landed = {
    run: randomUUID(),
    students: new Set(),
    seatRows: new Set(),
    ensembles: [],
    generation: plan.differences.generation,
  };
  let committed: CommittedImport;
  try {
    const bulk = await loadsInBulk(database, plan);
    if (!bulk) await landNewStudents(database, plan, landed);
    committed = await inSqlTransaction(database, async (session) => {
      if (!plan.canCommit) {
        const result = uncommittedResult(plan);
        return { ...result, importId: await recordHistory(session, plan, result, userId, meta) };
      }
      if (database.kind === 'postgres')
        await session.query(`select pg_advisory_xact_lock(hashtext('tutti roster import'))`);
      // First, before this transaction's own writes move the generation.
      const onlyDifferences = await planStillHolds(database, session, landed.generation);
      const { schoolIdByCode, year } = await schoolsAndYear(session);
      const ensembles = await ensureEnsembles(session, plan, schoolIdByCode);
      if (database.kind === 'pglite') await skipReferenceTriggers(session);
      await createStagingTables(session);
      const { existing, fresh } = await studentRows(
        session,
        plan,
        schoolIdByCode,
        onlyDifferences,
        landed,
      );
      await stage(
        session,
        plan,
        { existing, fresh },
        schoolIdByCode,
        ensembles.ensembleId,
        onlyDifferences,
        landed,
      );
      const updated = await updateStudents(session, plan, userId, year?.id ?? null);
      // A bulk load builds the secondary indexes again once the new students and seats are in.
      const rebuild =
        bulk && fresh.length >= bulkLoadAtLeast ? await dropSecondaryIndexes(session) : [];
      const created = new Set([...landed.students, ...(await insertStudents(session, fresh))]);
      await journalCreated(
        session,
        [...created],
        ensembles.created.map((row) => row.id),
        landed.students.size > 0 ? landed.run : null,
      );
      if (landed.students.size > 0)
        await session.query('delete from roster_import_landings where run = $1::text', [
          landed.run,
        ]);
      const seatChanges = year ? await seatStudents(session, year.id) : new Set<string>();
      const seatsLeft = year
        ? await endLeftSeats(session, plan, year.id, userId)
        : new Set<string>();
      for (const definition of rebuild) await session.query(definition);
      const schoolIds = plan.schoolCodes.map((code) => schoolIdByCode.get(code)!);
      const removed = await applyDeltaRemovals(session, plan, year?.id ?? null, userId);
      const withdrawn =
        (plan.options.withdrawMissing
          ? await withdrawMissing(session, schoolIds, year?.id ?? null, userId)
          : 0) + removed.withdrawn;

      const counts = { created: 0, updated: removed.endedSeats, unchanged: 0 };
      const firstRows = new Set<number>();
      const seenStudents = new Set<string>();
      for (const [index, { row }] of plan.parsed.rows.entries())
        if (!seenStudents.has(row.studentId)) {
          seenStudents.add(row.studentId);
          firstRows.add(index);
        }
      for (const [index, { row }] of plan.parsed.rows.entries()) {
        if (created.has(row.studentId)) counts.created += 1;
        else if (updated.has(row.studentId)) counts.updated += 1;
        else if (
          row.ensemble &&
          seatChanges.has(
            `${row.studentId} ${ensembles.ensembleId(schoolIdByCode.get(row.schoolCode)!, row.ensemble)}`,
          )
        )
          counts.updated += 1;
        // A seat left counts on the student's first row, as the plan counts it.
        else if (firstRows.has(index) && seatsLeft.has(row.studentId)) counts.updated += 1;
        else counts.unchanged += 1;
      }
      const result: ImportResult = {
        rows: plan.counts.rows,
        ...counts,
        withdrawn,
        errors: plan.errors,
        committed: true,
      };
      const importId = await recordHistory(session, plan, result, userId, meta);
      await saveJournal(session, importId, schoolIds, year?.id ?? null);
      await session.query(
        `insert into audit_log (user_id, action, entity, entity_id, before, after) values ($1::int, 'import', 'roster_import', $2, null, $3::jsonb)`,
        [
          userId,
          String(importId),
          JSON.stringify({
            fileName: meta.fileName,
            via: meta.via,
            rows: result.rows,
            created: result.created,
            updated: result.updated,
            unchanged: result.unchanged,
            withdrawn,
            errors: result.errors.length,
            newEnsembles: [...landed.ensembles, ...ensembles.created.map((row) => row.name)],
          }),
        ],
      );
      return { ...result, importId };
    });
  } catch (error) {
    // A failed slice or final transaction rolls itself back; the slices before it go here.
    if (landed.students.size > 0) await takeBackLanded(database, landed.run);
    throw error;
  }
  // A big change moves the planner's picture of the roster (see refreshStatistics): gathered
  // again once the import has answered, so no one waits for it (about 0.15 s for 18,000 new
  // students here); pages asked for meanwhile are planned with the old picture.
  const changed = committed.created + committed.updated + committed.withdrawn;
  if (committed.committed && changed > 0) {
    afterAnswering(database, 'Gathering the roster statistics after an import', async () => {
      if (await statisticsStale(database.db, 'students', changed))
        await refreshStatistics(database.db, rosterTables);
    });
  }
  return committed;
}
