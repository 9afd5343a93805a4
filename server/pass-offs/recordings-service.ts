import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { passOffRecordings, passOffs, students } from '../db/schema/index';
import type { Recording } from '@shared/api/pass-off';
import { recordingContentTypes } from '@shared/api/pass-off';
import { assertInScope, type Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { maySeeStudent } from './pass-off-rows';
import { recordingTypeOf } from './recording-type';
import { recordingPath, removeRecordingFile, writeRecordingFile } from './recordings-store';

/** An uploaded file as multer hands it over (kept in memory, never written by its own name). */
export interface UploadedFile {
  buffer: Buffer;
  originalname: string;
  size: number;
}

async function passOffWithSchool(db: Database, id: number) {
  const [row] = await db
    .select({ passOff: passOffs, schoolId: students.schoolId })
    .from(passOffs)
    .innerJoin(students, eq(students.id, passOffs.studentId))
    .where(eq(passOffs.id, id));
  if (!row) throw notFound('That pass-off');
  return row;
}

function cleanName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? '';
  // Control characters never belong in a name shown back to people.
  const printable = [...base]
    .filter((character) => character.charCodeAt(0) >= 0x20 && character.charCodeAt(0) !== 0x7f)
    .join('');
  return printable.trim().slice(0, 200) || 'recording';
}

/**
 * Attaches a recording to a pass-off of the actor's schools, replacing any earlier one. The
 * type is read from the file's bytes; anything but WebM, Ogg, MP3, WAVE or MP4 audio is refused.
 */
export async function attachRecording(
  db: Database,
  actor: Actor,
  dataDir: string,
  passOffId: number,
  file: UploadedFile | undefined,
): Promise<Recording> {
  const { passOff, schoolId } = await passOffWithSchool(db, passOffId);
  assertInScope(actor, schoolId, 'That pass-off');
  if (!file || file.size === 0) {
    throw badRequest('Attach the recording as the form field "recording".', [
      { field: 'recording', message: 'No file was sent.' },
    ]);
  }
  const contentType = recordingTypeOf(file.buffer);
  if (!contentType) {
    throw badRequest(
      `That file is not a recording Tuttiboard can keep: send ${recordingContentTypes.join(', ')} audio.`,
      [
        {
          field: 'recording',
          message: 'The file’s content is not WebM, Ogg, MP3, WAVE or MP4 audio.',
        },
      ],
    );
  }
  const storedName = writeRecordingFile(dataDir, file.buffer);
  try {
    const { recording, replaced } = await db.transaction(async (tx) => {
      const previous = await tx
        .select()
        .from(passOffRecordings)
        .where(eq(passOffRecordings.passOffId, passOffId));
      if (previous.length)
        await tx.delete(passOffRecordings).where(eq(passOffRecordings.passOffId, passOffId));
      const [row] = await tx
        .insert(passOffRecordings)
        .values({
          passOffId,
          storedName,
          originalName: cleanName(file.originalname),
          contentType,
          size: file.size,
          sha256: createHash('sha256').update(file.buffer).digest('hex'),
        })
        .returning();
      await tx
        .update(passOffs)
        .set({ recordingId: row!.id, updatedAt: new Date() })
        .where(eq(passOffs.id, passOffId));
      await recordAudit(tx, actor, {
        action: 'create',
        entity: 'pass-off-recording',
        entityId: row!.id,
        before: previous[0] ?? null,
        after: { ...row, passOffId: passOff.id },
      });
      return { recording: row!, replaced: previous };
    });
    for (const old of replaced) removeRecordingFile(dataDir, old.storedName);
    return {
      id: recording.id,
      originalName: recording.originalName,
      contentType,
      size: recording.size,
      sha256: recording.sha256,
      createdAt: recording.createdAt.toISOString(),
    };
  } catch (error) {
    removeRecordingFile(dataDir, storedName);
    throw error;
  }
}

/** The stored file of a pass-off's recording, when the actor may hear it. */
export async function openRecording(
  db: Database,
  actor: Actor,
  dataDir: string,
  passOffId: number,
) {
  const { passOff, schoolId } = await passOffWithSchool(db, passOffId);
  if (!maySeeStudent(actor, { id: passOff.studentId, schoolId })) throw notFound('That pass-off');
  const [recording] = await db
    .select()
    .from(passOffRecordings)
    .where(eq(passOffRecordings.id, passOff.recordingId ?? -1));
  if (!recording) throw notFound('A recording of that pass-off');
  const file = recordingPath(dataDir, recording.storedName);
  if (!fs.existsSync(file)) throw notFound('A recording of that pass-off');
  return { file, recording };
}
