import type { ImportPlan } from './import-plan';
import type { SqlSession } from './sql-session';
import { withdrawStudents } from './import-writes';

/**
 * Carries out a OneRoster delta's removals inside the import's transaction: withdraws its
 * `tobedeleted` students who are still active (ending their seats of the year) and ends the
 * seats whose enrolment it marks `tobedeleted`, each with an audit entry and a journal row (so
 * undoing the import makes them active again, as it does an import's other withdrawals). Answers
 * how many students were withdrawn and seats ended.
 */
export async function applyDeltaRemovals(
  session: SqlSession,
  plan: ImportPlan,
  schoolYearId: number | null,
  userId: number | null,
): Promise<{ withdrawn: number; endedSeats: number }> {
  const { studentIds, endedSeats } = plan.deltaRemovals;
  const withdrawn =
    studentIds.length > 0
      ? await withdrawStudents(
          session,
          's.student_number = any($2::text[])',
          studentIds,
          schoolYearId,
          userId,
        )
      : 0;
  let ended = 0;
  if (endedSeats.length > 0 && schoolYearId !== null) {
    const [row] = await session.query<{ count: number }>(
      `with ending as (
         select * from unnest($2::text[], $3::int[]) as e(student_number, ensemble_id)
       ), ended as (
         update enrollments en set active = false, version = en.version + 1, updated_at = now()
         from students s, ending
         where s.id = en.student_id and s.student_number = ending.student_number
           and en.ensemble_id = ending.ensemble_id and en.school_year_id = $4::int and en.active
         returning en.id, en.student_id, en.ensemble_id, en.version
       ), journaled as (
         insert into import_journal (kind, student_id, enrollment_id, ensemble_id, before, version_after)
         select 'seat-ended', student_id, id, ensemble_id, jsonb_build_object('active', true), version
         from ended
       ), audited as (
         insert into audit_log (user_id, action, entity, entity_id, before, after)
         select $1::int, 'update', 'enrollment', ended.id::text, jsonb_build_object('active', true),
           jsonb_build_object('active', false, 'student_id', ended.student_id,
             'ensemble_id', ended.ensemble_id)
         from ended
       )
       select count(*)::int as count from ended`,
      [
        userId,
        endedSeats.map((seat) => seat.studentId),
        endedSeats.map((seat) => seat.ensembleId),
        schoolYearId,
      ],
    );
    ended = row!.count;
  }
  return { withdrawn, endedSeats: ended };
}
