import type { ImportPlan } from './import-plan';
import { queryJson, type SqlSession } from './sql-session';

/**
 * What a committed import did, row by row, so it can be taken back (import-undo.ts): each
 * statement of the commit adds what it wrote to the temporary `import_journal`, and
 * {@link saveJournal} keeps it under the import's history row. `before` holds the values the
 * statement replaced; `version_after` the row's version once the import wrote it, so an undo can
 * tell a row someone edited since.
 */
export async function createJournal(session: SqlSession) {
  await session.query(`create temp table import_journal (
    kind text not null, student_id integer, enrollment_id integer, ensemble_id integer,
    before jsonb, version_after integer) on commit drop`);
}

/** Journals the students the import added (and, from its landing slices, their ensembles). */
export async function journalCreated(
  session: SqlSession,
  studentNumbers: string[],
  ensembleIds: number[],
) {
  await session.query(
    `insert into import_journal (kind, student_id, version_after)
     select 'student-created', id, version from students where student_number = any($1::text[])`,
    [studentNumbers],
  );
  await session.query(
    `insert into import_journal (kind, ensemble_id)
     select 'ensemble-created', id from ensembles where id = any($1::int[])`,
    [ensembleIds],
  );
}

/**
 * Ends the current-year seats the plan found the file's students leaving (see
 * `ImportPlan.endedSeats`), with an audit entry each; answers the student ids whose seats ended.
 */
export async function endLeftSeats(
  session: SqlSession,
  plan: ImportPlan,
  schoolYearId: number,
  userId: number | null,
): Promise<Set<string>> {
  if (plan.endedSeats.length === 0) return new Set();
  const numbers = await queryJson<string>(
    session,
    `with ended as (
       update enrollments en set active = false, version = en.version + 1, updated_at = now()
       from students s, unnest($1::text[], $2::int[]) as gone (number, ensemble)
       where s.student_number = gone.number and en.student_id = s.id
         and en.ensemble_id = gone.ensemble and en.school_year_id = $3::int and en.active
       returning en.id, en.student_id, en.ensemble_id, en.version, s.student_number
     ), journaled as (
       insert into import_journal (kind, student_id, enrollment_id, ensemble_id, before, version_after)
       select 'seat-ended', student_id, id, ensemble_id, jsonb_build_object('active', true), version
       from ended
     ), audited as (
       insert into audit_log (user_id, action, entity, entity_id, before, after)
       select $4::int, 'update', 'enrollment', id::text, jsonb_build_object('active', true),
         jsonb_build_object('active', false)
       from ended
     )
     select json_agg(distinct student_number)::text as json from ended`,
    [
      plan.endedSeats.map((seat) => seat.studentId),
      plan.endedSeats.map((seat) => seat.ensembleId),
      schoolYearId,
      userId,
    ],
  );
  return new Set(numbers);
}

/** Keeps the journal under the import's history row, with the schools and year it wrote. */
export async function saveJournal(
  session: SqlSession,
  importId: number,
  schoolIds: number[],
  schoolYearId: number | null,
) {
  await session.query(
    `insert into roster_import_changes
       (import_id, kind, student_id, enrollment_id, ensemble_id, before, version_after)
     select $1::int, kind, student_id, enrollment_id, ensemble_id, before, version_after
     from import_journal`,
    [importId],
  );
  await session.query(
    `update roster_imports set school_ids = $2::int[], school_year_id = $3::int where id = $1::int`,
    [importId, schoolIds, schoolYearId],
  );
}
