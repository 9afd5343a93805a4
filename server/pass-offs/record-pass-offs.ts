import { and, eq, inArray } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { enrollments, ladderRequirements, passOffs, students } from '../db/schema/index';
import { currentSchoolYearId } from '../enrollments/school-year';
import type { PassOff, PassOffBatchResult, PassOffInput } from '@shared/api/pass-off';
import { assertInScope, type Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { badRequest, conflict, notFound } from '../core/errors';
import { countWeeks, recomputeAttainment, weekChange } from '../ladder/attainment';
import { activeVersionId } from '../ladder/ladder-queries';
import { ladderContext, selectPassOffs, toPassOff } from './pass-off-rows';
import { studentNameColumns } from '../students/student-row';

async function passOffsByIds(db: Transaction, ids: number[]): Promise<PassOff[]> {
  if (ids.length === 0) return [];
  // One after the other: a transaction is one connection, which runs one query at a time.
  const rows = await selectPassOffs(db).where(inArray(passOffs.id, ids));
  const context = await ladderContext(db);
  const byId = new Map(rows.map((row) => [row.id, toPassOff(row, context)]));
  return ids.map((id) => byId.get(id)!);
}

/** The latest day a pass-off may be dated: tomorrow (UTC), so no time zone refuses today. */
export function latestHeardOn(): string {
  return new Date(Date.now() + 24 * 60 * 60 * 1000).toISOString().slice(0, 10);
}

/**
 * Records pass-offs for students of the actor's schools, against the active ladder. A pass-off
 * whose client key was recorded before is answered as it stands, not recorded again.
 */
export async function recordPassOffs(
  db: Database,
  actor: Actor,
  inputs: PassOffInput[],
): Promise<PassOffBatchResult> {
  const ladder = await checkedAgainstLadder(db, inputs);
  const studentsById = await studentsInScope(db, actor, inputs);
  await assertSeated(db, inputs);
  const arrived = new Date();

  return db.transaction(async (tx) => {
    const keys = inputs.flatMap((input) => (input.clientKey ? [input.clientKey] : []));
    const { knownByKey, toInsert } = await sortedByClientKey(tx, inputs, keys);
    const rows = toInsert.map((input) => {
      const student = studentsById.get(input.studentId)!;
      return {
        studentId: input.studentId,
        schoolId: student.schoolId,
        grade: student.grade,
        ladderVersionId: ladder.versionId,
        requirementId: ladder.requirementIds.get(input.requirementCode)!,
        requirementCode: input.requirementCode,
        heardOn: input.heardOn,
        tempo: input.tempo,
        passed: input.passed,
        heardBy: actor.userId,
        note: input.note,
        clientKey: input.clientKey ?? null,
        enteredAt: input.enteredAt ? earliest(new Date(input.enteredAt), arrived) : null,
      };
    });
    const inserted = await insertPassOffs(tx, actor, rows);
    const keyed = keys.length
      ? await tx
          .select({ id: passOffs.id, clientKey: passOffs.clientKey })
          .from(passOffs)
          .where(inArray(passOffs.clientKey, keys))
      : [];
    const insertedByKey = new Map(keyed.map((row) => [row.clientKey!, row.id]));
    const unkeyedIds = inserted.filter((row) => !row.clientKey).map((row) => row.id);
    let unkeyedIndex = 0;
    const ids = inputs.map((input) =>
      input.clientKey
        ? (knownByKey.get(input.clientKey)?.id ?? insertedByKey.get(input.clientKey)!)
        : unkeyedIds[unkeyedIndex++]!,
    );
    return {
      rows: await passOffsByIds(tx, ids),
      created: inserted.length,
      repeated: inputs.length - inserted.length,
    };
  });
}

/**
 * The active ladder's version and its requirements by code; refuses (400, per entry) a date
 * heard in the future or a requirement the ladder in force does not have.
 */
async function checkedAgainstLadder(
  db: Database,
  inputs: PassOffInput[],
): Promise<{ versionId: number; requirementIds: Map<string, number> }> {
  const versionId = await activeVersionId(db);
  if (versionId === null)
    throw badRequest('No scale ladder has been published yet, so there is nothing to pass off.');
  const latest = latestHeardOn();
  const fieldErrors = inputs.flatMap((input, index) =>
    input.heardOn > latest
      ? [{ field: `passOffs.${index}.heardOn`, message: 'The date heard cannot be in the future.' }]
      : [],
  );
  const requirementRows = await db
    .select({ id: ladderRequirements.id, code: ladderRequirements.code })
    .from(ladderRequirements)
    .where(eq(ladderRequirements.ladderVersionId, versionId));
  const requirementIds = new Map(requirementRows.map((row) => [row.code, row.id]));
  inputs.forEach((input, index) => {
    if (!requirementIds.has(input.requirementCode)) {
      fieldErrors.push({
        field: `passOffs.${index}.requirementCode`,
        message: `The ladder in force has no requirement ${input.requirementCode}.`,
      });
    }
  });
  if (fieldErrors.length)
    throw badRequest(
      `The pass-offs have ${fieldErrors.length} problem${fieldErrors.length === 1 ? '' : 's'}: ${fieldErrors[0]!.message}`,
      fieldErrors,
    );
  return { versionId, requirementIds };
}

/** The students the pass-offs name, each in the actor's schools (else 404 or 403). */
async function studentsInScope(db: Database, actor: Actor, inputs: PassOffInput[]) {
  const studentIds = [...new Set(inputs.map((input) => input.studentId))];
  const studentRows = await db
    .select({ id: students.id, schoolId: students.schoolId, grade: students.grade })
    .from(students)
    .where(inArray(students.id, studentIds));
  const studentsById = new Map(studentRows.map((row) => [row.id, row]));
  for (const studentId of studentIds) {
    const student = studentsById.get(studentId);
    if (!student) throw notFound('That student');
    assertInScope(actor, student.schoolId, 'That student');
  }
  return studentsById;
}

/**
 * The pass-offs recorded before under the same client keys, and those still to insert (one per
 * new key, and every unkeyed one); a key used before for another student or requirement is a 409.
 */
async function sortedByClientKey(tx: Transaction, inputs: PassOffInput[], keys: string[]) {
  const known = keys.length
    ? await tx
        .select({
          id: passOffs.id,
          clientKey: passOffs.clientKey,
          studentId: passOffs.studentId,
          requirementCode: passOffs.requirementCode,
        })
        .from(passOffs)
        .where(inArray(passOffs.clientKey, keys))
    : [];
  const knownByKey = new Map(known.map((row) => [row.clientKey!, row]));
  const fresh = new Map<string, PassOffInput>();
  const unkeyed: PassOffInput[] = [];
  for (const input of inputs) {
    const previous = input.clientKey ? knownByKey.get(input.clientKey) : undefined;
    if (
      previous &&
      (previous.studentId !== input.studentId || previous.requirementCode !== input.requirementCode)
    ) {
      throw conflict(
        `The client key ${input.clientKey} was already used for another pass-off; make a new key for each pass-off.`,
      );
    }
    if (previous) continue;
    if (input.clientKey) fresh.set(input.clientKey, input);
    else unkeyed.push(input);
  }
  return { knownByKey, toInsert: [...fresh.values(), ...unkeyed] };
}

/** Inserts the rows, then the weekly counts, the students' attainment and the history. */
async function insertPassOffs(
  tx: Transaction,
  actor: Actor,
  rows: (typeof passOffs.$inferInsert)[],
) {
  const inserted = rows.length
    ? await tx
        .insert(passOffs)
        .values(rows)
        // A retry racing its own first attempt on another connection lands here, not in a 500.
        .onConflictDoNothing({ target: passOffs.clientKey })
        .returning()
    : [];
  await countWeeks(
    tx,
    inserted.map((row) => weekChange(row, 1)),
  );
  await recomputeAttainment(
    tx,
    inserted.map((row) => row.studentId),
  );
  await recordAudit(
    tx,
    actor,
    ...inserted.map((row) => ({
      action: 'create',
      entity: 'pass-off',
      entityId: row.id,
      after: row,
    })),
  );
  return inserted;
}

/**
 * Refuses (400, nothing recorded) the pass-offs entered for an ensemble whose student no longer
 * has an active seat in it this school year: an entry that waited on a device while the student
 * left the ensemble is answered with the reason, per entry, rather than filed under the student.
 */
async function assertSeated(db: Database, inputs: PassOffInput[]): Promise<void> {
  const ensembleIds = [...new Set(inputs.flatMap((input) => input.ensembleId ?? []))];
  if (ensembleIds.length === 0) return;
  const studentIds = [...new Set(inputs.map((input) => input.studentId))];
  const seats = await db
    .select({ studentId: enrollments.studentId, ensembleId: enrollments.ensembleId })
    .from(enrollments)
    .where(
      and(
        inArray(enrollments.ensembleId, ensembleIds),
        inArray(enrollments.studentId, studentIds),
        eq(enrollments.active, true),
        eq(enrollments.schoolYearId, currentSchoolYearId),
      ),
    );
  const seated = new Set(seats.map((seat) => `${seat.studentId} ${seat.ensembleId}`));
  const unseated = inputs
    .map((input, index) => ({ input, index }))
    .filter(
      ({ input }) => input.ensembleId && !seated.has(`${input.studentId} ${input.ensembleId}`),
    );
  if (unseated.length === 0) return;
  const names = await db
    .select({
      id: students.id,
      ...studentNameColumns,
    })
    .from(students)
    .where(inArray(students.id, [...new Set(unseated.map(({ input }) => input.studentId))]));
  const nameById = new Map(
    names.map((row) => [row.id, `${row.preferredName ?? row.firstName} ${row.lastName}`]),
  );
  const fieldErrors = unseated.map(({ input, index }) => ({
    field: `passOffs.${index}.ensembleId`,
    message: `${nameById.get(input.studentId) ?? 'This student'} no longer has a seat in this ensemble, so the pass-off was not recorded.`,
  }));
  throw badRequest(
    fieldErrors.length === 1
      ? fieldErrors[0]!.message
      : `${fieldErrors.length} pass-offs are for students no longer seated in the ensemble: ${fieldErrors[0]!.message}`,
    fieldErrors,
  );
}

function earliest(a: Date, b: Date): Date {
  return a.getTime() < b.getTime() ? a : b;
}
