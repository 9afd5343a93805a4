import { and, desc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type {
  StudentDetail,
  StudentEnrollment,
  StudentInput,
  StudentPatch,
} from '@shared/api/student';
import { rowsOf, type Database, type Transaction } from '../db/client';
import {
  enrollments,
  ensembles,
  schoolMoves,
  schoolYears,
  schools,
  students,
  users,
} from '../db/schema/index';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { assertInScope, type Actor } from '../core/policy';
import { createThenRead, insertAudited, updateAudited } from '../core/versioned-update';
import { assertDistrictSchool } from '../schools/school-exists';
import { instrumentName } from '../enrollments/instrument-order';
import { seatColumns } from '../enrollments/enrollment-row';
import { findCurrentSchoolYear } from '../enrollments/school-year';
import { seatSummaries } from './student-seats';
import { studentColumns, toStudent, type StudentRecord } from './student-row';

const what = 'That student';

/**
 * The student row, when the actor may see it: staff within their schools, a student only
 * their own row. Anything else is a 404, as if the row did not exist.
 */
export async function findVisibleStudent(
  db: Database | Transaction,
  actor: Actor,
  id: number,
): Promise<StudentRecord> {
  if (actor.role === 'student' && actor.studentId !== id) throw notFound(what);
  const [record] = await db
    .select(studentColumns)
    .from(students)
    .innerJoin(schools, eq(schools.id, students.schoolId))
    .where(eq(students.id, id));
  if (!record) throw notFound(what);
  if (actor.role !== 'student') assertInScope(actor, record.schoolId, what);
  return record;
}

const fromSchool = alias(schools, 'from_school');
const toSchool = alias(schools, 'to_school');

async function currentSeats(
  db: Database,
  studentId: number,
  schoolYearId: number | undefined,
): Promise<StudentEnrollment[]> {
  if (schoolYearId === undefined) return [];
  const rows = await db
    .select({
      id: enrollments.id,
      ensembleId: enrollments.ensembleId,
      ensembleName: ensembles.name,
      ...seatColumns,
    })
    .from(enrollments)
    .innerJoin(ensembles, eq(ensembles.id, enrollments.ensembleId))
    .innerJoin(schoolYears, eq(schoolYears.id, enrollments.schoolYearId))
    .where(
      and(
        eq(enrollments.studentId, studentId),
        eq(enrollments.schoolYearId, schoolYearId),
        eq(enrollments.active, true),
      ),
    )
    .orderBy(ensembles.name);
  return rows.map((row) => ({ ...row, instrumentName: instrumentName(row.instrumentId) }));
}

async function movesOf(db: Database, studentId: number): Promise<StudentDetail['moves']> {
  const rows = await db
    .select({
      id: schoolMoves.id,
      fromId: fromSchool.id,
      fromCode: fromSchool.code,
      fromName: fromSchool.name,
      toId: toSchool.id,
      toCode: toSchool.code,
      toName: toSchool.name,
      movedAt: schoolMoves.movedAt,
      movedByName: users.name,
    })
    .from(schoolMoves)
    .leftJoin(fromSchool, eq(fromSchool.id, schoolMoves.fromSchoolId))
    .innerJoin(toSchool, eq(toSchool.id, schoolMoves.toSchoolId))
    .leftJoin(users, eq(users.id, schoolMoves.movedBy))
    .where(eq(schoolMoves.studentId, studentId))
    .orderBy(desc(schoolMoves.movedAt), desc(schoolMoves.id));
  return rows.map((row) => ({
    id: row.id,
    fromSchool:
      row.fromId === null ? null : { id: row.fromId, code: row.fromCode!, name: row.fromName! },
    toSchool: { id: row.toId, code: row.toCode, name: row.toName },
    movedAt: row.movedAt.toISOString(),
    movedByName: row.movedByName,
  }));
}

/** One student with their school, current seats and moves between schools. */
export async function getStudent(db: Database, actor: Actor, id: number): Promise<StudentDetail> {
  const record = await findVisibleStudent(db, actor, id);
  const year = await findCurrentSchoolYear(db);
  const [seats, enrollmentRows, moves, years] = await Promise.all([
    seatSummaries(db, [id], year?.id),
    currentSeats(db, id, year?.id),
    movesOf(db, id),
    pastYearsOf(db, id),
  ]);
  return {
    ...toStudent(record, seats(id), actor),
    school: { id: record.schoolId, code: record.schoolCode, name: record.schoolName },
    enrollments: enrollmentRows,
    moves,
    years,
  };
}

/** The student's past school years, newest first, as the year starts recorded them. */
async function pastYearsOf(db: Database, studentId: number): Promise<StudentDetail['years']> {
  return rowsOf<StudentDetail['years'][number]>(
    await db.execute(sql`
      select sy.school_year_id as "schoolYearId", y.name as year, sc.code as "schoolCode",
        sc.name as "schoolName", sy.grade, sy.outcome, sy.rung,
        coalesce((select array_agg(e.name order by e.name) from enrollments en
          join ensembles e on e.id = en.ensemble_id
          where en.student_id = sy.student_id and en.school_year_id = sy.school_year_id and en.active), '{}') as ensembles
      from student_years sy join school_years y on y.id = sy.school_year_id
      join schools sc on sc.id = sy.school_id
      where sy.student_id = ${studentId}
      order by y.starts_on desc`),
  );
}

async function assertStudentNumberFree(
  db: Database | Transaction,
  studentNumber: string,
  exceptId?: number,
) {
  const [clash] = await db
    .select({ id: students.id })
    .from(students)
    .where(sql`lower(${students.studentNumber}) = ${studentNumber.toLowerCase()}`);
  if (clash && clash.id !== exceptId) {
    throw badRequest(`The student id ${studentNumber} is already on the roster.`, [
      { field: 'studentNumber', message: `${studentNumber} is already another student's id.` },
    ]);
  }
}

/** Adds a student to a school the actor works with. */
export async function createStudent(
  db: Database,
  actor: Actor,
  input: StudentInput,
): Promise<StudentDetail> {
  assertInScope(actor, input.schoolId, 'That school');
  await assertDistrictSchool(db, input.schoolId, 'schoolId');
  return createThenRead(
    db,
    async (tx) => {
      await assertStudentNumberFree(tx, input.studentNumber);
      return insertAudited(
        tx,
        actor,
        students,
        { ...input, status: input.status ?? 'active' },
        'student',
      );
    },
    (id) => getStudent(db, actor, id),
  );
}

/**
 * Changes a student's details (or withdraws them), refusing a stale version. A school other
 * than the current one is refused: changing school is a move, which keeps the history.
 */
export async function updateStudent(
  db: Database,
  actor: Actor,
  id: number,
  patch: StudentPatch,
  requestedSchoolId?: unknown,
): Promise<StudentDetail> {
  const { version, ...changes } = patch;
  await db.transaction(async (tx) => {
    const record = await findVisibleStudent(tx, actor, id);
    if (requestedSchoolId !== undefined && requestedSchoolId !== record.schoolId) {
      throw badRequest('A change of school is a move: POST /api/students/:id/move.', [
        { field: 'schoolId', message: 'Move the student to change their school.' },
      ]);
    }
    if (changes.studentNumber) await assertStudentNumberFree(tx, changes.studentNumber, id);
    const target = { table: students, id, entity: 'student', what };
    const { before } = await updateAudited(tx, actor, target, version, changes);
    // A student who drops leaves their seats, as a roster import's withdrawal does; the
    // enrollment rows stay, inactive, for the history.
    if (before?.status === 'active' && changes.status === 'withdrawn') {
      const unseated = await tx
        .update(enrollments)
        .set({ active: false, version: sql`${enrollments.version} + 1`, updatedAt: new Date() })
        .where(and(eq(enrollments.studentId, id), eq(enrollments.active, true)))
        .returning({ id: enrollments.id });
      if (unseated.length) {
        await recordAudit(tx, actor, {
          action: 'withdraw',
          entity: 'student',
          entityId: id,
          before: { activeEnrollments: unseated.map((seat) => seat.id) },
          after: { activeEnrollments: [] },
        });
      }
    }
  });
  return getStudent(db, actor, id);
}
