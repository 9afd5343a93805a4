import { count, eq, inArray, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { PassOff, PassOffStanding, Recording } from '@shared/api/pass-off';
import {
  ladderRequirements,
  ladderVersions,
  passOffRecordings,
  passOffs,
  students,
  users,
} from '../db/schema/index';
import type { Actor } from '../core/policy';
import type { Queryable } from '../ladder/ladder-queries';
import { studentNameColumns } from '../students/student-row';

const heardBy = alias(users, 'heard_by_user');

/** The columns a pass-off is answered with, joined to its student, hearer and recording. */
export const passOffColumns = {
  id: passOffs.id,
  studentId: passOffs.studentId,
  ...studentNameColumns,
  schoolId: students.schoolId,
  requirementCode: passOffs.requirementCode,
  ladderVersionId: passOffs.ladderVersionId,
  heardOn: passOffs.heardOn,
  tempo: passOffs.tempo,
  passed: passOffs.passed,
  heardById: passOffs.heardBy,
  heardByName: heardBy.name,
  note: passOffs.note,
  clientKey: passOffs.clientKey,
  enteredAt: passOffs.enteredAt,
  version: passOffs.version,
  createdAt: passOffs.createdAt,
  updatedAt: passOffs.updatedAt,
  recordingId: passOffRecordings.id,
  recordingOriginalName: passOffRecordings.originalName,
  recordingContentType: passOffRecordings.contentType,
  recordingSize: passOffRecordings.size,
  recordingSha256: passOffRecordings.sha256,
  recordingCreatedAt: passOffRecordings.createdAt,
};

/** A select of pass-offs with everything an answer needs; add where, order and paging. */
export function selectPassOffs(db: Queryable) {
  return db
    .select(passOffColumns)
    .from(passOffs)
    .innerJoin(students, eq(students.id, passOffs.studentId))
    .leftJoin(heardBy, eq(heardBy.id, passOffs.heardBy))
    .leftJoin(passOffRecordings, eq(passOffRecordings.id, passOffs.recordingId));
}

/** How many pass-offs a filter on `selectPassOffs` matches (it may name the student's columns). */
export function countPassOffs(db: Queryable, where: SQL | undefined) {
  return db
    .select({ total: count() })
    .from(passOffs)
    .innerJoin(students, eq(students.id, passOffs.studentId))
    .where(where);
}

type PassOffRow = Awaited<ReturnType<typeof selectPassOffs>>[number];

/** What the active ladder asks of each requirement code (its tempo), and the version names. */
export interface LadderContext {
  activeVersionId: number | null;
  activeVersionName: string | null;
  tempoByCode: Map<string, number>;
  versionNames: Map<number, string>;
}

/** Loads what a pass-off's standing is judged against. */
export async function ladderContext(db: Queryable): Promise<LadderContext> {
  const versions = await db
    .select({ id: ladderVersions.id, name: ladderVersions.name, active: ladderVersions.active })
    .from(ladderVersions);
  const active = versions.find((version) => version.active);
  const requirements = active
    ? await db
        .select({ code: ladderRequirements.code, tempo: ladderRequirements.tempo })
        .from(ladderRequirements)
        .where(eq(ladderRequirements.ladderVersionId, active.id))
    : [];
  return {
    activeVersionId: active?.id ?? null,
    activeVersionName: active?.name ?? null,
    tempoByCode: new Map(requirements.map((requirement) => [requirement.code, requirement.tempo])),
    versionNames: new Map(versions.map((version) => [version.id, version.name])),
  };
}

/** How a pass-off stands under the active ladder, and why in words when it no longer counts. */
export function standingOf(
  passOff: { passed: boolean; requirementCode: string; tempo: number; ladderVersionId: number },
  context: LadderContext,
): { standing: PassOffStanding; standingNote: string | null } {
  if (!passOff.passed) return { standing: 'not-yet', standingNote: null };
  const heardUnder = context.versionNames.get(passOff.ladderVersionId) ?? 'an earlier ladder';
  const tempo = context.tempoByCode.get(passOff.requirementCode);
  if (tempo === undefined) {
    return {
      standing: 'requirement-gone',
      standingNote: `Passed under "${heardUnder}", but the ladder in force${context.activeVersionName ? ` ("${context.activeVersionName}")` : ''} has no requirement ${passOff.requirementCode} any more, so this pass-off no longer counts.`,
    };
  }
  if (passOff.tempo < tempo) {
    const changed = passOff.ladderVersionId !== context.activeVersionId;
    return {
      standing: 'below-tempo',
      standingNote: changed
        ? `Passed at ♩ = ${passOff.tempo} under "${heardUnder}"; the ladder in force asks ♩ = ${tempo} for ${passOff.requirementCode}, so this pass-off no longer counts.`
        : `Passed at ♩ = ${passOff.tempo}, slower than the ♩ = ${tempo} that ${passOff.requirementCode} asks, so it does not count.`,
    };
  }
  return { standing: 'counts', standingNote: null };
}

function toRecording(row: PassOffRow): Recording | null {
  if (row.recordingId === null) return null;
  return {
    id: row.recordingId,
    originalName: row.recordingOriginalName!,
    contentType: row.recordingContentType as Recording['contentType'],
    size: row.recordingSize!,
    sha256: row.recordingSha256!,
    createdAt: row.recordingCreatedAt!.toISOString(),
  };
}

/** A joined row as the API answers it. */
export function toPassOff(row: PassOffRow, context: LadderContext): PassOff {
  return {
    id: row.id,
    studentId: row.studentId,
    studentName: `${row.preferredName ?? row.firstName} ${row.lastName}`,
    schoolId: row.schoolId,
    requirementCode: row.requirementCode,
    ladderVersionId: row.ladderVersionId,
    heardOn: row.heardOn,
    tempo: row.tempo,
    passed: row.passed,
    heardById: row.heardById,
    heardByName: row.heardByName,
    note: row.note,
    recording: toRecording(row),
    clientKey: row.clientKey,
    ...standingOf(row, context),
    version: row.version,
    enteredAt: (row.enteredAt ?? row.createdAt).toISOString(),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** The students whose pass-offs the actor may read: their schools, or (a student) their own. */
export function studentScopeCondition(actor: Actor): SQL | undefined {
  if (actor.role === 'student')
    return actor.studentId === null ? sql`false` : eq(students.id, actor.studentId);
  if (actor.role === 'coordinator') return undefined;
  return actor.schoolIds.length ? inArray(students.schoolId, actor.schoolIds) : sql`false`;
}

/** Whether the actor may read pass-offs of a student at this school. */
export function maySeeStudent(actor: Actor, student: { id: number; schoolId: number }): boolean {
  if (actor.role === 'student') return actor.studentId === student.id;
  if (actor.role === 'coordinator') return true;
  if (actor.role === 'technician') return false;
  return actor.schoolIds.includes(student.schoolId);
}
