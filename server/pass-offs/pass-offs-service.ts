import { and, desc, eq, exists, gte, lte, sql, type SQL } from 'drizzle-orm';
import { oneByOne, type Database, type Transaction } from '../db/client';
import { enrollments, passOffs, students } from '../db/schema/index';
import type { ListResponse } from '@shared/api/list';
import { passOffFiltersSchema, type PassOff, type PassOffPatch } from '@shared/api/pass-off';
import { assertInScope, type Actor } from '../core/policy';
import { listPage, matchesText, orderFor, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { updateVersioned } from '../core/versioned-update';
import { countWeeks, recomputeAttainment, weekChange } from '../ladder/attainment';
import {
  ladderContext,
  maySeeStudent,
  countPassOffs,
  selectPassOffs,
  studentScopeCondition,
  toPassOff,
} from './pass-off-rows';
import { removeRecordingFile } from './recordings-store';
import { latestHeardOn } from './record-pass-offs';

const sortable = {
  heardOn: passOffs.heardOn,
  tempo: passOffs.tempo,
  requirementCode: passOffs.requirementCode,
  studentName: sql`lower(${students.lastName} || ' ' || ${students.firstName})`,
  createdAt: passOffs.createdAt,
};

/** Pass-offs of the students the actor may see, filtered, sorted and paged. */
export async function listPassOffs(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<PassOff>> {
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
          .where(
            and(
              eq(enrollments.studentId, passOffs.studentId),
              eq(enrollments.ensembleId, list.ensembleId),
              eq(enrollments.active, true),
            ),
          ),
      ),
    );
  }
  conditions.push(
    matchesText(list.q, [students.lastName, students.firstName, passOffs.requirementCode]),
  );
  const where = and(...conditions);
  const [page, context] = await Promise.all([
    listPage(
      list,
      orderFor(list.sort, sortable, 'heardOn:desc', passOffs.id),
      selectPassOffs(db).where(where).$dynamic(),
      countPassOffs(db, where),
      (row) => row,
    ),
    ladderContext(db),
  ]);
  return { rows: page.rows.map((row) => toPassOff(row, context)), total: page.total };
}

/** One pass-off the actor may see; 404 otherwise. */
export async function getPassOff(
  db: Database | Transaction,
  actor: Actor,
  id: number,
): Promise<PassOff> {
  // One after the other: `db` may be a transaction (see oneByOne).
  const [[row], context] = await oneByOne(
    () => selectPassOffs(db).where(eq(passOffs.id, id)),
    () => ladderContext(db),
  );
  if (!row || !maySeeStudent(actor, { id: row.studentId, schoolId: row.schoolId }))
    throw notFound('That pass-off');
  return toPassOff(row, context);
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
export async function updatePassOff(
  db: Database,
  actor: Actor,
  id: number,
  patch: PassOffPatch,
): Promise<PassOff> {
  const { version, ...changes } = patch;
  if (changes.heardOn && changes.heardOn > latestHeardOn()) {
    throw badRequest('The date heard cannot be in the future.', [
      { field: 'heardOn', message: 'The date heard cannot be in the future.' },
    ]);
  }
  return db.transaction(async (tx) => {
    const before = await loadForWrite(tx, actor, id);
    const after = await updateVersioned(tx, passOffs, id, version, changes, 'That pass-off');
    await countWeeks(tx, [weekChange(before, -1), weekChange(after, 1)]);
    await recomputeAttainment(tx, [after.studentId]);
    await recordAudit(tx, actor, {
      action: 'update',
      entity: 'pass-off',
      entityId: id,
      before,
      after,
    });
    return getPassOff(tx, actor, id);
  });
}

/** Removes a pass-off entered in error, with its recording. */
export async function deletePassOff(
  db: Database,
  actor: Actor,
  id: number,
  dataDir: string,
): Promise<void> {
  const storedNames = await db.transaction(async (tx) => {
    const before = await loadForWrite(tx, actor, id);
    const removed = await tx.execute(
      sql`delete from pass_off_recordings r where r.pass_off_id = ${id} returning r.stored_name`,
    );
    await tx.delete(passOffs).where(eq(passOffs.id, id));
    await countWeeks(tx, [weekChange(before, -1)]);
    await recomputeAttainment(tx, [before.studentId]);
    await recordAudit(tx, actor, { action: 'delete', entity: 'pass-off', entityId: id, before });
    return (removed as unknown as { rows: { stored_name: string }[] }).rows.map(
      (row) => row.stored_name,
    );
  });
  for (const name of storedNames) removeRecordingFile(dataDir, name);
}

/** The newest pass-offs of one student, for their history (the caller checks scope). */
export async function passOffsOfStudent(db: Database, studentId: number): Promise<PassOff[]> {
  const [rows, context] = await Promise.all([
    selectPassOffs(db)
      .where(eq(passOffs.studentId, studentId))
      .orderBy(desc(passOffs.heardOn), desc(passOffs.id)),
    ladderContext(db),
  ]);
  return rows.map((row) => toPassOff(row, context));
}
