import { and, eq } from 'drizzle-orm';
import type { Enrollment, EnrollmentInput, EnrollmentPatch } from '@shared/api/enrollment';
import type { Database, Transaction } from '../db/client';
import { enrollments } from '../db/schema/index';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { assertInScope, type Actor } from '../core/policy';
import { createThenRead, insertAudited, updateAudited } from '../core/versioned-update';
import { findVisibleEnsemble } from '../ensembles/ensembles-service';
import { findVisibleStudent } from '../students/students-service';
import { selectEnrollments, toEnrollment } from './enrollment-row';
import { assertYearOpen, currentSchoolYear } from './school-year';

const what = 'That enrollment';

/** One enrollment, when its ensemble belongs to one of the actor's schools; otherwise a 404. */
export async function getEnrollment(
  db: Database | Transaction,
  actor: Actor,
  id: number,
): Promise<Enrollment> {
  const [record] = await selectEnrollments(db).where(eq(enrollments.id, id));
  if (!record) throw notFound(what);
  assertInScope(actor, record.schoolId, what);
  return toEnrollment(record);
}

/**
 * Seats a student in an ensemble of their own school for the current school year. Both must be
 * in the actor's schools (else 404); a withdrawn student, another school's ensemble or a seat
 * the student already has answer 400.
 */
export async function createEnrollment(
  db: Database,
  actor: Actor,
  input: EnrollmentInput,
): Promise<Enrollment> {
  return createThenRead(
    db,
    async (tx) => {
      const student = await findVisibleStudent(tx, actor, input.studentId);
      const ensemble = await findVisibleEnsemble(tx, actor, input.ensembleId);
      const name = `${student.firstName} ${student.lastName}`;
      if (ensemble.schoolId !== student.schoolId) {
        throw badRequest(
          `${ensemble.name} is at ${ensemble.schoolName}, but ${name} is at ${student.schoolName}.`,
          [{ field: 'ensembleId', message: `Choose an ensemble of ${student.schoolName}.` }],
        );
      }
      if (student.status !== 'active') {
        throw badRequest(`${name} is withdrawn; make them active again before seating them.`, [
          { field: 'studentId', message: 'This student is withdrawn.' },
        ]);
      }
      const year = await currentSchoolYear(tx);
      const [existing] = await tx
        .select({ id: enrollments.id, active: enrollments.active })
        .from(enrollments)
        .where(
          and(
            eq(enrollments.studentId, student.id),
            eq(enrollments.ensembleId, ensemble.id),
            eq(enrollments.schoolYearId, year.id),
          ),
        );
      if (existing) {
        throw badRequest(
          `${name} already has a seat in ${ensemble.name} for ${year.name} (enrollment ${existing.id}${existing.active ? '' : ', ended'}); change that seat instead.`,
          [{ field: 'ensembleId', message: `Already seated in ${ensemble.name} this year.` }],
        );
      }
      return insertAudited(
        tx,
        actor,
        enrollments,
        {
          studentId: student.id,
          ensembleId: ensemble.id,
          schoolYearId: year.id,
          instrumentId: input.instrumentId,
          part: input.part,
          chair: input.chair,
        },
        'enrollment',
      );
    },
    (id) => getEnrollment(db, actor, id),
  );
}

/** Changes a seat's instrument, part, chair or active flag, refusing a stale version. */
export async function updateEnrollment(
  db: Database,
  actor: Actor,
  id: number,
  patch: EnrollmentPatch,
): Promise<Enrollment> {
  const { version, ...changes } = patch;
  await db.transaction(async (tx) => {
    await assertYearOpen(tx, await getEnrollment(tx, actor, id));
    const target = { table: enrollments, id, entity: 'enrollment', what };
    await updateAudited(tx, actor, target, version, changes);
  });
  return getEnrollment(db, actor, id);
}

/** Removes a seat (a seat entered by mistake; a student who leaves is ended with active: false). */
export async function deleteEnrollment(db: Database, actor: Actor, id: number): Promise<void> {
  await db.transaction(async (tx) => {
    await assertYearOpen(tx, await getEnrollment(tx, actor, id));
    const [before] = await tx.delete(enrollments).where(eq(enrollments.id, id)).returning();
    await recordAudit(tx, actor, { action: 'delete', entity: 'enrollment', entityId: id, before });
  });
}
