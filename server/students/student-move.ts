import { and, eq, inArray, sql } from 'drizzle-orm';
import type { StudentDetail, StudentMove } from '@shared/api/student';
import type { Database, Transaction } from '../db/client';
import { enrollments, ensembles, schoolMoves, students } from '../db/schema/index';
import { recordAudit } from '../core/audit';
import { badRequest } from '../core/errors';
import { assertInScope, type Actor } from '../core/policy';
import { updateVersioned } from '../core/versioned-update';
import { assertDistrictSchool } from '../schools/school-exists';
import { findVisibleStudent, getStudent } from './students-service';

type VisibleStudent = Awaited<ReturnType<typeof findVisibleStudent>>;

/** The school moved to must be another school of the district. */
async function assertDestination(
  tx: Transaction,
  student: VisibleStudent,
  move: StudentMove,
): Promise<void> {
  if (move.toSchoolId === student.schoolId) {
    throw badRequest(
      `${student.firstName} ${student.lastName} is already at ${student.schoolName}.`,
      [{ field: 'toSchoolId', message: 'Choose a different school.' }],
    );
  }
  await assertDistrictSchool(tx, move.toSchoolId, 'toSchoolId');
}

/** Ends (keeps, marks inactive) the student's active seats in a school's ensembles. */
async function endSeatsAt(tx: Transaction, id: number, schoolId: number) {
  const oldEnsembles = tx
    .select({ id: ensembles.id })
    .from(ensembles)
    .where(eq(ensembles.schoolId, schoolId));
  const endedBefore = await tx
    .select()
    .from(enrollments)
    .where(
      and(
        eq(enrollments.studentId, id),
        eq(enrollments.active, true),
        inArray(enrollments.ensembleId, oldEnsembles),
      ),
    );
  const ended = endedBefore.length
    ? await tx
        .update(enrollments)
        .set({ active: false, version: sql`${enrollments.version} + 1`, updatedAt: new Date() })
        .where(
          inArray(
            enrollments.id,
            endedBefore.map((seat) => seat.id),
          ),
        )
        .returning()
    : [];
  return { endedBefore, ended };
}

/**
 * Moves a student to another school. The student keeps their id, pass-offs and past seats:
 * the move is written to school_moves, and their active seats in the old school's ensembles
 * are ended (kept, marked inactive). The actor must work with both schools.
 */
export async function moveStudent(
  db: Database,
  actor: Actor,
  id: number,
  move: StudentMove,
): Promise<StudentDetail> {
  await db.transaction(async (tx) => {
    const student = await findVisibleStudent(tx, actor, id);
    assertInScope(actor, move.toSchoolId, 'That school');
    await assertDestination(tx, student, move);
    const [before] = await tx.select().from(students).where(eq(students.id, id));
    const after = await updateVersioned(
      tx,
      students,
      id,
      move.version,
      { schoolId: move.toSchoolId },
      'That student',
    );
    const [schoolMove] = await tx
      .insert(schoolMoves)
      .values({
        studentId: id,
        fromSchoolId: student.schoolId,
        toSchoolId: move.toSchoolId,
        movedBy: actor.userId,
      })
      .returning();
    const { endedBefore, ended } = await endSeatsAt(tx, id, student.schoolId);
    await recordAudit(
      tx,
      actor,
      { action: 'move', entity: 'student', entityId: id, before, after: { ...after, schoolMove } },
      ...ended.map((seat) => ({
        action: 'update',
        entity: 'enrollment',
        entityId: seat.id,
        before: endedBefore.find((old) => old.id === seat.id),
        after: seat,
      })),
    );
  });
  return getStudent(db, actor, id);
}
