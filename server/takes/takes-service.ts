import { and, desc, eq, inArray, lt, sql, type SQL } from 'drizzle-orm';
import type { Database } from '../db/client';
import { schoolYears, students, takes } from '../db/schema/index';
import {
  defaultTakeRetention,
  takeRetentionSchema,
  type Take,
  type TakeRetention,
} from '@shared/api/take';
import type { RecordingContentType } from '@shared/api/pass-off';
import { recordAudit } from '../core/audit';
import { insertAudited } from '../core/versioned-update';
import { badRequest, forbidden, notFound } from '../core/errors';
import type { Actor } from '../core/policy';
import { readSetting, writeSetting } from '../core/settings';
import { activeRuleLadder } from '../ladder/ladder-queries';
import { recordingTypeOf } from '../pass-offs/recording-type';
import {
  recordingPath,
  removeRecordingFile,
  writeRecordingFile,
} from '../pass-offs/recordings-store';
import type { UploadedFile } from '../pass-offs/recordings-service';
import type { z } from 'zod';
import type { heardTakeInputSchema, takeInputSchema } from '@shared/api/take';
import { assertInScope } from '../core/policy';

/** The district setting (server/core/settings.ts) that holds how long takes are kept. */
export const takeRetentionKey = 'take-retention';

type TakeRow = typeof takes.$inferSelect;

const takeColumns = {
  take: takes,
  studentName: sql<string>`${students.lastName} || ', ' || ${students.firstName}`,
  schoolId: students.schoolId,
};

function toTake(row: { take: TakeRow; studentName: string }): Take {
  const { take } = row;
  return {
    id: take.id,
    studentId: take.studentId,
    studentName: row.studentName,
    requirementCode: take.requirementId,
    tempoAsked: take.tempoAsked,
    contentType: take.contentType as RecordingContentType,
    size: take.size,
    analysis: take.analysis as Take['analysis'],
    status: take.status,
    sentAt: take.sentAt?.toISOString() ?? null,
    createdAt: take.createdAt.toISOString(),
    heardLive: take.recordedBy !== null,
  };
}

/**
 * Who hears a take: the student it belongs to always; once sent, the directors of the student's
 * school and the coordinator. Nobody else (not viewers, not technicians).
 */
function mayHear(actor: Actor, take: TakeRow, schoolId: number): boolean {
  if (actor.role === 'student') return actor.studentId === take.studentId;
  if (take.status !== 'sent') return false;
  if (actor.role === 'coordinator') return true;
  if (actor.role === 'director') return actor.schoolIds.includes(schoolId);
  return false;
}

async function takeWithSchool(db: Database, actor: Actor, id: number) {
  const [row] = await db
    .select(takeColumns)
    .from(takes)
    .innerJoin(students, eq(students.id, takes.studentId))
    .where(eq(takes.id, id));
  if (!row || !mayHear(actor, row.take, row.schoolId)) throw notFound('That take');
  return row;
}

/** The takes an actor may hear, newest first; `studentId` narrows to one student. */
export async function listTakes(
  db: Database,
  actor: Actor,
  query: { studentId?: number },
): Promise<Take[]> {
  const conditions: SQL[] = [];
  if (actor.role === 'student') {
    conditions.push(eq(takes.studentId, actor.studentId ?? -1));
  } else {
    conditions.push(eq(takes.status, 'sent'));
    if (actor.role === 'director') {
      if (actor.schoolIds.length === 0) return [];
      conditions.push(inArray(students.schoolId, actor.schoolIds));
    } else if (actor.role !== 'coordinator') {
      throw forbidden();
    }
  }
  if (query.studentId !== undefined) conditions.push(eq(takes.studentId, query.studentId));
  const rows = await db
    .select(takeColumns)
    .from(takes)
    .innerJoin(students, eq(students.id, takes.studentId))
    .where(and(...conditions))
    .orderBy(desc(takes.createdAt), desc(takes.id))
    .limit(500);
  return rows.map(toTake);
}

/**
 * Keeps a take: the recording (its type read from its bytes) and the analysis the browser made
 * of it. The requirement must be on the active ladder and the analysis must have one entry per
 * note of it; nothing is stored otherwise. A student keeps their own ('kept' until they send
 * it); a director of the student's school, or the coordinator, keeps the take they recorded
 * while hearing the student as evidence of the pass-off: sent at once, so the student, the
 * school's directors and the coordinator hear it, under the same retention as every take.
 */
async function storeTake(
  db: Database,
  actor: Actor,
  dataDir: string,
  input: z.infer<typeof takeInputSchema>,
  file: UploadedFile | undefined,
  heardBy: { studentId: number; userId: number } | null,
): Promise<Take> {
  if (!file || file.size === 0) {
    throw badRequest('Attach the take as the form field "recording".', [
      { field: 'recording', message: 'No file was sent.' },
    ]);
  }
  const contentType = recordingTypeOf(file.buffer);
  if (!contentType) {
    throw badRequest('That file is not a recording: send WebM, Ogg, MP3, WAVE or MP4 audio.', [
      { field: 'recording', message: 'The file’s content is not audio Tuttiboard can keep.' },
    ]);
  }
  const ladder = await activeRuleLadder(db);
  const requirement = ladder?.rungs
    .flatMap((rung) => rung.requirements)
    .find((candidate) => candidate.id === input.requirementCode);
  if (!requirement) {
    throw badRequest('That requirement is not on the ladder.', [
      { field: 'requirementCode', message: `No requirement ${input.requirementCode}.` },
    ]);
  }
  const studentId = heardBy?.studentId ?? actor.studentId!;
  const storedName = writeRecordingFile(dataDir, file.buffer);
  try {
    return await db.transaction(async (tx) => {
      const row = await insertAudited(
        tx,
        actor,
        takes,
        {
          studentId,
          requirementId: requirement.id,
          tempoAsked: input.tempoAsked,
          storedName,
          contentType,
          size: file.size,
          analysis: input.analysis,
          ...(heardBy
            ? { status: 'sent' as const, sentAt: new Date(), recordedBy: heardBy.userId }
            : {}),
        },
        'take',
        (stored) => ({ ...stored, analysis: undefined }),
      );
      const [student] = await tx
        .select({ name: takeColumns.studentName })
        .from(students)
        .where(eq(students.id, studentId));
      return toTake({ take: row!, studentName: student?.name ?? '' });
    });
  } catch (error) {
    removeRecordingFile(dataDir, storedName);
    throw error;
  }
}

/** Keeps a student's own take, 'kept' until they send it (see {@link storeTake}). */
export async function keepTake(
  db: Database,
  actor: Actor,
  dataDir: string,
  input: z.infer<typeof takeInputSchema>,
  file: UploadedFile | undefined,
): Promise<Take> {
  if (actor.role !== 'student' || actor.studentId === null) throw forbidden();
  return storeTake(db, actor, dataDir, input, file, null);
}

/**
 * Keeps the take a director recorded while hearing a student of their school (the coordinator:
 * any student) as evidence of the pass-off (see {@link storeTake}). A student outside the
 * actor's schools answers 404.
 */
export async function keepHeardTake(
  db: Database,
  actor: Actor,
  dataDir: string,
  input: z.infer<typeof heardTakeInputSchema>,
  file: UploadedFile | undefined,
): Promise<Take> {
  if (actor.role !== 'director' && actor.role !== 'coordinator') throw forbidden();
  const [student] = await db
    .select({ schoolId: students.schoolId })
    .from(students)
    .where(eq(students.id, input.studentId));
  assertInScope(actor, student?.schoolId, 'That student');
  return storeTake(db, actor, dataDir, input, file, {
    studentId: input.studentId,
    userId: actor.userId,
  });
}

/** Sends a student's own take to their directors: "ready to be heard". */
export async function sendTake(db: Database, actor: Actor, id: number): Promise<Take> {
  const row = await takeWithSchool(db, actor, id);
  if (actor.role !== 'student') throw forbidden();
  if (row.take.status === 'sent') return toTake(row);
  const [updated] = await db
    .update(takes)
    .set({ status: 'sent', sentAt: new Date() })
    .where(eq(takes.id, id))
    .returning();
  await recordAudit(db, actor, {
    action: 'update',
    entity: 'take',
    entityId: id,
    before: { status: row.take.status },
    after: { status: 'sent' },
  });
  return toTake({ take: updated!, studentName: row.studentName });
}

/** The stored file of a take the actor may hear. */
export async function openTake(db: Database, actor: Actor, dataDir: string, id: number) {
  const row = await takeWithSchool(db, actor, id);
  return { file: recordingPath(dataDir, row.take.storedName), take: row.take };
}

/** How long the district keeps takes (default: until the end of the school year). */
export async function takeRetention(db: Database): Promise<TakeRetention> {
  const stored = takeRetentionSchema.safeParse(await readSetting(db, takeRetentionKey));
  return stored.success ? stored.data : defaultTakeRetention;
}

/** Sets how long the district keeps takes. */
export async function setTakeRetention(
  db: Database,
  actor: Actor,
  retention: TakeRetention,
): Promise<TakeRetention> {
  const before = await takeRetention(db);
  await writeSetting(db, takeRetentionKey, retention);
  await recordAudit(db, actor, {
    action: 'update',
    entity: 'take-retention',
    entityId: 0,
    before,
    after: retention,
  });
  return retention;
}

/**
 * Removes the takes whose time is up, rows and files: with 'school-year', those made during a
 * school year that ended before today (a take made outside every year goes a year after it was
 * made); with 'days', those older than that many days. Answers how many went.
 */
export async function removeExpiredTakes(
  db: Database,
  dataDir: string,
  now = new Date(),
): Promise<number> {
  const retention = await takeRetention(db);
  const today = now.toISOString().slice(0, 10);
  let condition: SQL;
  if (retention.keep === 'days') {
    condition = lt(takes.createdAt, new Date(now.getTime() - retention.days * 86_400_000));
  } else {
    const inEndedYear = sql`exists (select 1 from ${schoolYears} where ${takes.createdAt}::date between ${schoolYears.startsOn} and ${schoolYears.endsOn} and ${schoolYears.endsOn} < ${today})`;
    const inNoYear = sql`not exists (select 1 from ${schoolYears} where ${takes.createdAt}::date between ${schoolYears.startsOn} and ${schoolYears.endsOn})`;
    const aYearAgo = new Date(now.getTime() - 365 * 86_400_000);
    condition = sql`(${inEndedYear} or (${inNoYear} and ${takes.createdAt} < ${aYearAgo}))`;
  }
  const removed = await db
    .delete(takes)
    .where(condition)
    .returning({ storedName: takes.storedName });
  for (const { storedName } of removed) removeRecordingFile(dataDir, storedName);
  return removed.length;
}
