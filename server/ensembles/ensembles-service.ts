import { and, count, eq } from 'drizzle-orm';
import { formatGradeLevel } from '@shared/roster/grade-level';
import type {
  EnsembleDetail,
  EnsembleInput,
  EnsembleMember,
  EnsemblePatch,
} from '@shared/api/ensemble';
import type { Database, Transaction } from '../db/client';
import { enrollments, ensembles, schools, students, userSchools, users } from '../db/schema/index';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { assertInScope, type Actor } from '../core/policy';
import { createThenRead, insertAudited, updateAudited } from '../core/versioned-update';
import { assertDistrictSchool } from '../schools/school-exists';
import { instrumentName, scorePosition } from '../enrollments/instrument-order';
import { findCurrentSchoolYear } from '../enrollments/school-year';
import { ensembleColumns, toEnsemble, type EnsembleRecord } from './ensemble-row';
import { studentNameColumns } from '../students/student-row';

const what = 'That ensemble';

/** The ensemble, when it belongs to one of the actor's schools; otherwise a 404. */
export async function findVisibleEnsemble(
  db: Database | Transaction,
  actor: Actor,
  id: number,
): Promise<EnsembleRecord> {
  const [record] = await db
    .select(ensembleColumns)
    .from(ensembles)
    .innerJoin(schools, eq(schools.id, ensembles.schoolId))
    .leftJoin(users, eq(users.id, ensembles.directorUserId))
    .where(eq(ensembles.id, id));
  if (!record) throw notFound(what);
  assertInScope(actor, record.schoolId, what);
  return record as EnsembleRecord;
}

async function membersOf(db: Database, ensembleId: number): Promise<EnsembleMember[]> {
  const year = await findCurrentSchoolYear(db);
  if (!year) return [];
  const rows = await db
    .select({
      enrollmentId: enrollments.id,
      enrollmentVersion: enrollments.version,
      studentId: students.id,
      studentNumber: students.studentNumber,
      ...studentNameColumns,
      grade: students.grade,
      instrumentId: enrollments.instrumentId,
      part: enrollments.part,
      chair: enrollments.chair,
      active: enrollments.active,
    })
    .from(enrollments)
    .innerJoin(students, eq(students.id, enrollments.studentId))
    .where(
      and(
        eq(enrollments.ensembleId, ensembleId),
        eq(enrollments.schoolYearId, year.id),
        eq(enrollments.active, true),
      ),
    );
  return rows
    .map((row) => ({
      ...row,
      gradeLabel: formatGradeLevel(row.grade),
      instrumentName: instrumentName(row.instrumentId),
    }))
    .sort(
      (a, b) =>
        scorePosition(a.instrumentId) - scorePosition(b.instrumentId) ||
        (a.chair ?? 1000) - (b.chair ?? 1000) ||
        a.lastName.localeCompare(b.lastName) ||
        a.firstName.localeCompare(b.firstName),
    );
}

/** One ensemble with its school and its seats of the current school year in score order. */
export async function getEnsemble(db: Database, actor: Actor, id: number): Promise<EnsembleDetail> {
  const record = await findVisibleEnsemble(db, actor, id);
  return {
    ...toEnsemble(record),
    school: { id: record.schoolId, code: record.schoolCode, name: record.schoolName },
    members: await membersOf(db, id),
  };
}

async function assertNameFree(
  db: Database | Transaction,
  schoolId: number,
  name: string,
  exceptId?: number,
) {
  const [clash] = await db
    .select({ id: ensembles.id })
    .from(ensembles)
    .where(and(eq(ensembles.schoolId, schoolId), eq(ensembles.name, name)));
  if (clash && clash.id !== exceptId) {
    throw badRequest(`The school already has an ensemble named ${name}.`, [
      { field: 'name', message: `${name} is already an ensemble of this school.` },
    ]);
  }
}

// A director of the ensemble is the coordinator or a director who works with its school.
async function assertDirectorFits(db: Database | Transaction, schoolId: number, userId: number) {
  const [user] = await db
    .select({ role: users.role, active: users.active })
    .from(users)
    .where(eq(users.id, userId));
  const assigned = await db
    .select({ schoolId: userSchools.schoolId })
    .from(userSchools)
    .where(and(eq(userSchools.userId, userId), eq(userSchools.schoolId, schoolId)));
  const fits =
    user?.active &&
    (user.role === 'coordinator' || (user.role === 'director' && assigned.length > 0));
  if (!fits) {
    throw badRequest('That person cannot direct this ensemble.', [
      {
        field: 'directorUserId',
        message: 'Choose the coordinator or a director who works with this school.',
      },
    ]);
  }
}

/** Adds an ensemble to a school the actor works with. */
export async function createEnsemble(
  db: Database,
  actor: Actor,
  input: EnsembleInput,
): Promise<EnsembleDetail> {
  assertInScope(actor, input.schoolId, 'That school');
  return createThenRead(
    db,
    async (tx) => {
      await assertDistrictSchool(tx, input.schoolId, 'schoolId');
      await assertNameFree(tx, input.schoolId, input.name);
      if (input.directorUserId !== null) {
        await assertDirectorFits(tx, input.schoolId, input.directorUserId);
      }
      return insertAudited(tx, actor, ensembles, input, 'ensemble');
    },
    (id) => getEnsemble(db, actor, id),
  );
}

/** Changes an ensemble, refusing a stale version. */
export async function updateEnsemble(
  db: Database,
  actor: Actor,
  id: number,
  patch: EnsemblePatch,
): Promise<EnsembleDetail> {
  const { version, ...changes } = patch;
  await db.transaction(async (tx) => {
    const record = await findVisibleEnsemble(tx, actor, id);
    if (changes.name) await assertNameFree(tx, record.schoolId, changes.name, id);
    if (changes.directorUserId)
      await assertDirectorFits(tx, record.schoolId, changes.directorUserId);
    const target = { table: ensembles, id, entity: 'ensemble', what };
    await updateAudited(tx, actor, target, version, changes);
  });
  return getEnsemble(db, actor, id);
}

/** Removes an ensemble that has no seats at all (past years' included). */
export async function deleteEnsemble(db: Database, actor: Actor, id: number): Promise<void> {
  await db.transaction(async (tx) => {
    const record = await findVisibleEnsemble(tx, actor, id);
    const [{ seats }] = (await tx
      .select({ seats: count() })
      .from(enrollments)
      .where(eq(enrollments.ensembleId, id))) as [{ seats: number }];
    if (seats > 0) {
      throw badRequest(
        `${record.name} still has ${seats} ${seats === 1 ? 'enrollment' : 'enrollments'} (this year's and past years'); remove them before deleting the ensemble.`,
      );
    }
    const [before] = await tx.delete(ensembles).where(eq(ensembles.id, id)).returning();
    await recordAudit(tx, actor, { action: 'delete', entity: 'ensemble', entityId: id, before });
  });
}
