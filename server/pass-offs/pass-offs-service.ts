import { and, count, desc, eq, exists, gte, ilike, inArray, lte, or, sql, type SQL } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { enrollments, ladderRequirements, passOffs, students } from '../db/schema/index';
import type { ListResponse } from '../../shared/api/list';
import {
  passOffFiltersSchema,
  type PassOff,
  type PassOffBatchResult,
  type PassOffInput,
  type PassOffPatch,
} from '../../shared/api/pass-off';
import { assertInScope, type Actor } from '../core/policy';
import { likePattern, orderFor, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { badRequest, conflict, notFound } from '../core/errors';
import { updateVersioned } from '../core/versioned-update';
import { countWeeks, recomputeAttainment } from '../ladder/attainment';
import { activeVersionId } from '../ladder/ladder-queries';
import { ladderContext, maySeeStudent, selectPassOffs, studentScopeCondition, toPassOff } from './pass-off-rows';
import { removeRecordingFile } from './recordings-store';

const sortable = {
  heardOn: passOffs.heardOn,
  tempo: passOffs.tempo,
  requirementCode: passOffs.requirementCode,
  studentName: sql`lower(${students.lastName} || ' ' || ${students.firstName})`,
  createdAt: passOffs.createdAt,
};

/** Pass-offs of the students the actor may see, filtered, sorted and paged. */
export async function listPassOffs(db: Database, actor: Actor, query: unknown): Promise<ListResponse<PassOff>> {
  const list = parseListQuery(query, passOffFiltersSchema);
  const conditions: (SQL | undefined)[] = [studentScopeCondition(actor)];
  if (list.studentId) conditions.push(eq(passOffs.studentId, list.studentId));
  if (list.schoolId) conditions.push(eq(students.schoolId, list.schoolId));
  if (list.requirementCode) conditions.push(eq(passOffs.requirementCode, list.requirementCode));
  if (list.from) conditions.push(gte(passOffs.heardOn, list.from));
  if (list.to) conditions.push(lte(passOffs.heardOn, list.to));
  if (list.passed !== undefined) conditions.push(eq(passOffs.passed, list.passed));
  if (list.ensembleId) {
    conditions.push(
      exists(
        db
          .select({ one: sql`1` })
          .from(enrollments)
          .where(and(eq(enrollments.studentId, passOffs.studentId), eq(enrollments.ensembleId, list.ensembleId), eq(enrollments.active, true))),
      ),
    );
  }
  if (list.q) {
    const pattern = likePattern(list.q);
    conditions.push(or(ilike(students.lastName, pattern), ilike(students.firstName, pattern), ilike(passOffs.requirementCode, pattern)));
  }
  const where = and(...conditions);
  const [rows, [total], context] = await Promise.all([
    selectPassOffs(db)
      .where(where)
      .orderBy(...orderFor(list.sort, sortable, 'heardOn:desc', passOffs.id))
      .limit(list.limit)
      .offset(list.offset),
    db.select({ total: count() }).from(passOffs).innerJoin(students, eq(students.id, passOffs.studentId)).where(where),
    ladderContext(db),
  ]);
  return { rows: rows.map((row) => toPassOff(row, context)), total: total!.total };
}

/** One pass-off the actor may see; 404 otherwise. */
export async function getPassOff(db: Database | Transaction, actor: Actor, id: number): Promise<PassOff> {
  const [[row], context] = await Promise.all([selectPassOffs(db).where(eq(passOffs.id, id)), ladderContext(db)]);
  if (!row || !maySeeStudent(actor, { id: row.studentId, schoolId: row.schoolId })) throw notFound('That pass-off');
  return toPassOff(row, context);
}

async function passOffsByIds(db: Transaction, ids: number[]): Promise<PassOff[]> {
  if (ids.length === 0) return [];
  const [rows, context] = await Promise.all([selectPassOffs(db).where(inArray(passOffs.id, ids)), ladderContext(db)]);
  const byId = new Map(rows.map((row) => [row.id, toPassOff(row, context)]));
  return ids.map((id) => byId.get(id)!);
}

function tomorrow(): string {
  return new Date(Date.now() + 24 * 60 * 60 * 1000).toISOString().slice(0, 10);
}

/**
 * Records pass-offs for students of the actor's schools, against the active ladder. A pass-off
 * whose client key was recorded before is answered as it stands, not recorded again.
 */
export async function recordPassOffs(db: Database, actor: Actor, inputs: PassOffInput[]): Promise<PassOffBatchResult> {
  const versionId = await activeVersionId(db);
  if (versionId === null) throw badRequest('No scale ladder has been published yet, so there is nothing to pass off.');
  const latest = tomorrow();
  const fieldErrors = inputs.flatMap((input, index) =>
    input.heardOn > latest ? [{ field: `passOffs.${index}.heardOn`, message: 'The date heard cannot be in the future.' }] : [],
  );
  const requirementRows = await db
    .select({ id: ladderRequirements.id, code: ladderRequirements.code })
    .from(ladderRequirements)
    .where(eq(ladderRequirements.ladderVersionId, versionId));
  const requirementIds = new Map(requirementRows.map((row) => [row.code, row.id]));
  inputs.forEach((input, index) => {
    if (!requirementIds.has(input.requirementCode)) {
      fieldErrors.push({ field: `passOffs.${index}.requirementCode`, message: `The ladder in force has no requirement ${input.requirementCode}.` });
    }
  });
  if (fieldErrors.length) throw badRequest(`The pass-offs have ${fieldErrors.length} problem${fieldErrors.length === 1 ? '' : 's'}: ${fieldErrors[0]!.message}`, fieldErrors);

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

  return db.transaction(async (tx) => {
    const keys = inputs.flatMap((input) => (input.clientKey ? [input.clientKey] : []));
    const known = keys.length
      ? await tx.select({ id: passOffs.id, clientKey: passOffs.clientKey, studentId: passOffs.studentId, requirementCode: passOffs.requirementCode }).from(passOffs).where(inArray(passOffs.clientKey, keys))
      : [];
    const knownByKey = new Map(known.map((row) => [row.clientKey!, row]));
    const fresh = new Map<string, PassOffInput>();
    const unkeyed: PassOffInput[] = [];
    for (const input of inputs) {
      const previous = input.clientKey ? knownByKey.get(input.clientKey) : undefined;
      if (previous && (previous.studentId !== input.studentId || previous.requirementCode !== input.requirementCode)) {
        throw conflict(`The client key ${input.clientKey} was already used for another pass-off; make a new key for each pass-off.`);
      }
      if (previous) continue;
      if (input.clientKey) fresh.set(input.clientKey, input);
      else unkeyed.push(input);
    }
    const toInsert = [...fresh.values(), ...unkeyed];
    const inserted = toInsert.length
      ? await tx
          .insert(passOffs)
          .values(
            toInsert.map((input) => {
              const student = studentsById.get(input.studentId)!;
              return {
                studentId: input.studentId,
                schoolId: student.schoolId,
                grade: student.grade,
                ladderVersionId: versionId,
                requirementId: requirementIds.get(input.requirementCode)!,
                requirementCode: input.requirementCode,
                heardOn: input.heardOn,
                tempo: input.tempo,
                passed: input.passed,
                heardBy: actor.userId,
                note: input.note,
                clientKey: input.clientKey ?? null,
              };
            }),
          )
          // A retry racing its own first attempt on another connection lands here, not in a 500.
          .onConflictDoNothing({ target: passOffs.clientKey })
          .returning()
      : [];
    await countWeeks(tx, inserted.map((row) => ({ heardOn: row.heardOn, schoolId: row.schoolId, grade: row.grade, passed: row.passed, delta: 1 as const })));
    await recomputeAttainment(tx, inserted.map((row) => row.studentId));
    await recordAudit(tx, actor, ...inserted.map((row) => ({ action: 'create', entity: 'pass-off', entityId: row.id, after: row })));
    const keyed = keys.length
      ? await tx.select({ id: passOffs.id, clientKey: passOffs.clientKey }).from(passOffs).where(inArray(passOffs.clientKey, keys))
      : [];
    const insertedByKey = new Map(keyed.map((row) => [row.clientKey!, row.id]));
    const unkeyedIds = inserted.filter((row) => !row.clientKey).map((row) => row.id);
    let unkeyedIndex = 0;
    const ids = inputs.map((input) =>
      input.clientKey ? (knownByKey.get(input.clientKey)?.id ?? insertedByKey.get(input.clientKey)!) : unkeyedIds[unkeyedIndex++]!,
    );
    const rows = await passOffsByIds(tx, ids);
    return { rows, created: inserted.length, repeated: inputs.length - inserted.length };
  });
}

async function loadForWrite(db: Database | Transaction, actor: Actor, id: number) {
  const [row] = await db
    .select({ passOff: passOffs, schoolOfStudent: students.schoolId })
    .from(passOffs)
    .innerJoin(students, eq(students.id, passOffs.studentId))
    .where(eq(passOffs.id, id));
  if (!row) throw notFound('That pass-off');
  assertInScope(actor, row.schoolOfStudent, 'That pass-off');
  return row.passOff;
}

/** Corrects a pass-off (date, tempo, result, note), refusing a stale version. */
export async function updatePassOff(db: Database, actor: Actor, id: number, patch: PassOffPatch): Promise<PassOff> {
  const { version, ...changes } = patch;
  if (changes.heardOn && changes.heardOn > tomorrow()) {
    throw badRequest('The date heard cannot be in the future.', [{ field: 'heardOn', message: 'The date heard cannot be in the future.' }]);
  }
  return db.transaction(async (tx) => {
    const before = await loadForWrite(tx, actor, id);
    const after = await updateVersioned(tx, passOffs, id, version, changes, 'That pass-off');
    await countWeeks(tx, [
      { heardOn: before.heardOn, schoolId: before.schoolId, grade: before.grade, passed: before.passed, delta: -1 },
      { heardOn: after.heardOn, schoolId: after.schoolId, grade: after.grade, passed: after.passed, delta: 1 },
    ]);
    await recomputeAttainment(tx, [after.studentId]);
    await recordAudit(tx, actor, { action: 'update', entity: 'pass-off', entityId: id, before, after });
    return getPassOff(tx, actor, id);
  });
}

/** Removes a pass-off entered in error, with its recording. */
export async function deletePassOff(db: Database, actor: Actor, id: number, dataDir: string): Promise<void> {
  const storedNames = await db.transaction(async (tx) => {
    const before = await loadForWrite(tx, actor, id);
    const removed = await tx.execute(sql`delete from pass_off_recordings r where r.pass_off_id = ${id} returning r.stored_name`);
    await tx.delete(passOffs).where(eq(passOffs.id, id));
    await countWeeks(tx, [{ heardOn: before.heardOn, schoolId: before.schoolId, grade: before.grade, passed: before.passed, delta: -1 }]);
    await recomputeAttainment(tx, [before.studentId]);
    await recordAudit(tx, actor, { action: 'delete', entity: 'pass-off', entityId: id, before });
    return (removed as unknown as { rows: { stored_name: string }[] }).rows.map((row) => row.stored_name);
  });
  for (const name of storedNames) removeRecordingFile(dataDir, name);
}

/** The newest pass-offs of one student, for their history (the caller checks scope). */
export async function passOffsOfStudent(db: Database, studentId: number): Promise<PassOff[]> {
  const [rows, context] = await Promise.all([
    selectPassOffs(db).where(eq(passOffs.studentId, studentId)).orderBy(desc(passOffs.heardOn), desc(passOffs.id)),
    ladderContext(db),
  ]);
  return rows.map((row) => toPassOff(row, context));
}
