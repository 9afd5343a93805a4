import { importUndoDays, type ImportUndoPreview, type ImportUndoResult } from '@shared/api/import';
import { HttpError, notFound } from '../core/errors';
import type { Actor } from '../core/policy';
import type { DatabaseHandle } from '../db/client';
import { inSqlTransaction, type SqlSession } from './sql-session';

interface ImportRow {
  id: number;
  file_name: string;
  committed: boolean;
  created_at: string;
  undone_at: string | null;
  school_ids: number[];
  school_year_id: number | null;
  changed: number;
  journaled: number;
  expired: boolean;
  undoable_until: string;
}

const plural = (count: number, one: string, many: string) =>
  `${count.toLocaleString('en-US')} ${count === 1 ? one : many}`;

const dayOf = (timestamp: string) => new Date(timestamp).toISOString().slice(0, 10);

/** The counts of what an undo would do, by kind of journal row. */
async function journalCounts(session: SqlSession, importId: number) {
  const rows = await session.query<{ kind: string; count: number }>(
    `select kind, count(*)::int as count from roster_import_changes where import_id = $1::int
     group by kind`,
    [importId],
  );
  const of = (...kinds: string[]) =>
    rows.filter((row) => kinds.includes(row.kind)).reduce((sum, row) => sum + row.count, 0);
  return {
    studentsRemoved: of('student-created'),
    studentsRestored: of('student-updated'),
    withdrawalsReversed: of('student-withdrawn'),
    seatsRestored: of('seat-added', 'seat-changed', 'seat-ended'),
    ensemblesRemoved: of('ensemble-created'),
  };
}

/**
 * Why the import cannot be undone: it committed nothing or is undone already, it is older than
 * the window, a later import wrote one of its schools, a new school year began, or work recorded
 * since depends on what it wrote (see `dependentWorkBlockers`).
 */
async function blockersOf(session: SqlSession, row: ImportRow): Promise<string[]> {
  if (!row.committed) return ['This import committed nothing, so there is nothing to undo.'];
  if (row.undone_at) return [`This import was already undone on ${dayOf(row.undone_at)}.`];
  const blockers: string[] = [];
  if (row.expired)
    blockers.push(
      `An import can be undone for ${importUndoDays} days; this one ran on ${dayOf(row.created_at)}.`,
    );
  if (row.changed > 0 && row.journaled === 0)
    blockers.push(
      'This import ran before imports kept a record of what they changed, so it cannot be undone.',
    );
  const [later] = await session.query<{ file_name: string; created_at: string }>(
    `select file_name, to_json(created_at)#>>'{}' as created_at from roster_imports
     where committed and undone_at is null and id > $1::int and school_ids && $2::int[]
     order by id desc limit 1`,
    [row.id, row.school_ids],
  );
  if (later)
    blockers.push(
      `A later import (“${later.file_name}”, ${dayOf(later.created_at)}) wrote the same schools; undo that one first.`,
    );
  if (row.school_year_id !== null) {
    const [year] = await session.query<{ id: number }>(
      'select id from school_years where current limit 1',
    );
    if (year && year.id !== row.school_year_id)
      blockers.push(
        'A new school year has started since this import, and its seats belong to the year before.',
      );
  }
  blockers.push(...(await dependentWorkBlockers(session, row.id)));
  return blockers;
}

/**
 * Work recorded since the import that depends on what it wrote: pass-offs, loans, takes or
 * accounts of the students it created; a student or seat it wrote edited since.
 */
async function dependentWorkBlockers(session: SqlSession, importId: number): Promise<string[]> {
  const blockers: string[] = [];
  const [depends] = await session.query<{
    pass_offs: number;
    loans: number;
    takes: number;
    accounts: number;
    students_edited: number;
    seats_edited: number;
  }>(
    `with created as (
       select student_id from roster_import_changes where import_id = $1::int and kind = 'student-created'
     ), written as (
       select c.kind, c.student_id, c.enrollment_id, c.version_after
       from roster_import_changes c where c.import_id = $1::int
     )
     select
       (select count(*)::int from pass_offs p join created c on c.student_id = p.student_id) as pass_offs,
       (select count(*)::int from loans o join created c on c.student_id = o.student_id) as loans,
       (select count(*)::int from takes t join created c on c.student_id = t.student_id) as takes,
       (select count(*)::int from users u join created c on c.student_id = u.student_id) as accounts,
       (select count(*)::int from written w left join students s on s.id = w.student_id
        where w.kind in ('student-created', 'student-updated', 'student-withdrawn')
          and (s.id is null or s.version <> w.version_after)) as students_edited,
       (select count(*)::int from written w left join enrollments en on en.id = w.enrollment_id
        where w.kind in ('seat-added', 'seat-changed', 'seat-ended')
          and (en.id is null or en.version <> w.version_after))
       + (select count(*)::int from enrollments en join students s on s.id = en.student_id
          join created c on c.student_id = en.student_id
          where en.version > 1 or en.created_at > s.created_at) as seats_edited`,
    [importId],
  );
  const { pass_offs, loans, takes, accounts, students_edited, seats_edited } = depends!;
  // What was added since for students the import created: [count, one, many, how it came].
  const sinceCreated: [number, string, string, string][] = [
    [pass_offs, 'pass-off has', 'pass-offs have', 'been recorded on'],
    [loans, 'loan has', 'loans have', 'been made to'],
    [takes, 'take has', 'takes have', 'been recorded by'],
    [accounts, 'sign-in account has', 'sign-in accounts have', 'been made for'],
  ];
  for (const [count, one, many, how] of sinceCreated)
    if (count > 0)
      blockers.push(`${plural(count, one, many)} since ${how} students this import created.`);
  if (students_edited > 0)
    blockers.push(
      `${plural(students_edited, 'student', 'students')} this import wrote ${students_edited === 1 ? 'has' : 'have'} been edited since.`,
    );
  if (seats_edited > 0)
    blockers.push(
      `${plural(seats_edited, 'seat', 'seats')} this import wrote or gave ${seats_edited === 1 ? 'has' : 'have'} been changed since.`,
    );
  return blockers;
}

async function importRow(session: SqlSession, importId: number): Promise<ImportRow> {
  const [row] = await session.query<ImportRow>(
    `select r.id, r.file_name, r.committed, to_json(r.created_at)#>>'{}' as created_at,
       to_json(r.undone_at)#>>'{}' as undone_at, r.school_ids,
       r.school_year_id, (r.created + r.updated + r.withdrawn)::int as changed,
       (select count(*)::int from roster_import_changes c where c.import_id = r.id) as journaled,
       r.created_at < now() - make_interval(days => $2::int) as expired,
       to_json(r.created_at + make_interval(days => $2::int))#>>'{}' as undoable_until
     from roster_imports r where r.id = $1::int`,
    [importId, importUndoDays],
  );
  if (!row) throw notFound('That import');
  return row;
}

async function preview(session: SqlSession, importId: number): Promise<ImportUndoPreview> {
  const row = await importRow(session, importId);
  const blockers = await blockersOf(session, row);
  return {
    importId: row.id,
    fileName: row.file_name,
    createdAt: new Date(row.created_at).toISOString(),
    undoableUntil: new Date(row.undoable_until).toISOString(),
    ...(await journalCounts(session, importId)),
    blockers,
    canUndo: blockers.length === 0,
  };
}

/** What undoing the import would do, and what blocks it; writes nothing. */
export async function previewImportUndo(
  database: DatabaseHandle,
  importId: number,
): Promise<ImportUndoPreview> {
  return inSqlTransaction(database, (session) => preview(session, importId));
}

/**
 * Reverses what the import's journal records: seats it added are removed and seats it changed
 * or ended put back, students it changed or withdrew get their fields and status back (a school
 * move back is recorded as a move), students it created are removed with their seats, and
 * ensembles it created go when no one sits in them.
 */
async function reverseJournal(session: SqlSession, importId: number, userId: number) {
  // Seats first: removing a created student removes its seats with it.
  await session.query(
    `with restored as (
       update enrollments en set
         active = coalesce((c.before->>'active')::boolean, en.active),
         instrument_id = case when c.before ? 'instrument_id' then c.before->>'instrument_id'
                         else en.instrument_id end,
         version = en.version + 1, updated_at = now()
       from roster_import_changes c
       where c.import_id = $1::int and c.kind in ('seat-changed', 'seat-ended')
         and en.id = c.enrollment_id
       returning en.id
     )
     delete from enrollments en using roster_import_changes c
     where c.import_id = $1::int and c.kind = 'seat-added' and en.id = c.enrollment_id`,
    [importId],
  );
  await session.query(
    `with prior as (
       select s.*, c.kind, c.before from students s
       join roster_import_changes c on c.student_id = s.id
       where c.import_id = $1::int and c.kind in ('student-updated', 'student-withdrawn')
     ), restored as (
       update students s set
         first_name = case when p.kind = 'student-updated' then p.before->>'first_name' else s.first_name end,
         last_name = case when p.kind = 'student-updated' then p.before->>'last_name' else s.last_name end,
         preferred_name = case when p.kind = 'student-updated' then p.before->>'preferred_name' else s.preferred_name end,
         grade = case when p.kind = 'student-updated' then (p.before->>'grade')::smallint else s.grade end,
         school_id = case when p.kind = 'student-updated' then (p.before->>'school_id')::int else s.school_id end,
         guardian_name = case when p.kind = 'student-updated' then p.before->>'guardian_name' else s.guardian_name end,
         guardian_email = case when p.kind = 'student-updated' then p.before->>'guardian_email' else s.guardian_email end,
         status = p.before->>'status',
         version = s.version + 1, updated_at = now()
       from prior p where s.id = p.id
       returning s.*
     ), moved as (
       insert into school_moves (student_id, from_school_id, to_school_id, moved_by)
       select r.id, p.school_id, r.school_id, $2::int from restored r join prior p on p.id = r.id
       where p.school_id <> r.school_id
     )
     insert into audit_log (user_id, action, entity, entity_id, before, after)
     select $2::int, 'update', 'student', r.id::text,
       to_jsonb(p) - 'kind' - 'before', to_jsonb(r)
     from restored r join prior p on p.id = r.id`,
    [importId, userId],
  );
  await session.query(
    `delete from students s using roster_import_changes c
     where c.import_id = $1::int and c.kind = 'student-created' and s.id = c.student_id`,
    [importId],
  );
  await session.query(
    `delete from ensembles e using roster_import_changes c
     where c.import_id = $1::int and c.kind = 'ensemble-created' and e.id = c.ensemble_id
       and not exists (select 1 from enrollments en where en.ensemble_id = e.id)`,
    [importId],
  );
}

/**
 * Takes a committed import back, all or nothing, in one transaction (see {@link reverseJournal}).
 * Refuses (409, naming each reason) while anything blocks it (see {@link blockersOf}); the
 * blockers are read again inside the transaction, which on a server holds the import lock.
 */
export async function undoImport(
  database: DatabaseHandle,
  importId: number,
  actor: Actor,
): Promise<ImportUndoResult> {
  return inSqlTransaction(database, async (session) => {
    if (database.kind === 'postgres')
      await session.query(`select pg_advisory_xact_lock(hashtext('tutti roster import'))`);
    const planned = await preview(session, importId);
    if (!planned.canUndo)
      throw new HttpError(
        409,
        'undo_blocked',
        `This import cannot be undone. ${planned.blockers.join(' ')}`,
      );
    const userId = actor.userId;
    await reverseJournal(session, importId, userId);
    const [done] = await session.query<{ undone_at: string }>(
      `update roster_imports set undone_at = now(), undone_by = $2::int
       where id = $1::int returning to_json(undone_at)#>>'{}' as undone_at`,
      [importId, userId],
    );
    const { blockers: _none, canUndo: _yes, ...counts } = planned;
    await session.query(
      `insert into audit_log (user_id, action, entity, entity_id, before, after)
       values ($1::int, 'undo', 'roster_import', $2, null, $3::jsonb)`,
      [userId, String(importId), JSON.stringify(counts)],
    );
    return { ...planned, undoneAt: new Date(done!.undone_at).toISOString() };
  });
}
