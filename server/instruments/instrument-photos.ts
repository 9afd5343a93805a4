import { randomBytes } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import { and, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { instrumentPhotos } from '../db/schema/index';
import type { InstrumentPhoto } from '@shared/api/instrument';
import type { Actor } from '../core/policy';
import { insertAudited } from '../core/versioned-update';
import { badRequest, notFound } from '../core/errors';
import { findInstrument } from './instruments-queries';

/** The largest photo accepted: 5 MB. */
export const photoSizeLimit = 5 * 1024 * 1024;

/**
 * The image type the bytes really hold, from their signature, or null: JPEG starts with the SOI
 * marker FF D8 and the next marker's FF (ITU-T T.81); PNG with the 8-byte signature 89 50 4E 47
 * 0D 0A 1A 0A (PNG specification, "PNG signature"); WebP with "RIFF", a size, then "WEBP"
 * (RFC 9649, the RIFF header).
 */
export function imageTypeOf(bytes: Uint8Array): 'image/jpeg' | 'image/png' | 'image/webp' | null {
  const starts = (offset: number, signature: number[]) =>
    signature.every((byte, index) => bytes[offset + index] === byte);
  if (starts(0, [0xff, 0xd8, 0xff])) return 'image/jpeg';
  if (starts(0, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'image/png';
  if (starts(0, [0x52, 0x49, 0x46, 0x46]) && starts(8, [0x57, 0x45, 0x42, 0x50]))
    return 'image/webp';
  return null;
}

/** The folder photos live in. */
export function photoFolder(dataDir: string): string {
  return path.join(dataDir, 'photos');
}

/** Keeps an uploaded photo of an instrument after checking what its bytes are. */
export async function addPhoto(
  db: Database,
  dataDir: string,
  actor: Actor,
  instrumentId: number,
  bytes: Uint8Array,
): Promise<InstrumentPhoto> {
  await findInstrument(db, actor, instrumentId);
  if (bytes.length === 0)
    throw badRequest('Attach a photo in the form field "photo".', [
      { field: 'photo', message: 'No file was sent.' },
    ]);
  if (bytes.length > photoSizeLimit)
    throw badRequest('A photo may be at most 5 MB.', [{ field: 'photo', message: 'Too large.' }]);
  const contentType = imageTypeOf(bytes);
  if (!contentType) {
    throw badRequest('That file is not a JPEG, PNG or WebP image.', [
      { field: 'photo', message: 'Only JPEG, PNG and WebP photos are kept.' },
    ]);
  }
  const fileName = randomBytes(18).toString('base64url');
  const folder = photoFolder(dataDir);
  await fs.mkdir(folder, { recursive: true });
  await fs.writeFile(path.join(folder, fileName), bytes, { flag: 'wx' });
  const row = await db.transaction(async (tx) => {
    const inserted = await insertAudited(
      tx,
      actor,
      instrumentPhotos,
      {
        instrumentId,
        fileName,
        contentType,
        sizeBytes: bytes.length,
        uploadedBy: actor.userId,
      },
      'instrument-photo',
    );
    return inserted;
  });
  return {
    id: row.id,
    contentType: row.contentType,
    sizeBytes: row.sizeBytes,
    url: `/api/instruments/${instrumentId}/photos/${row.id}`,
    createdAt: row.createdAt.toISOString(),
  };
}

/** A photo's bytes and type, when the actor may see its instrument. */
export async function readPhoto(
  db: Database,
  dataDir: string,
  actor: Actor,
  instrumentId: number,
  photoId: number,
): Promise<{ contentType: string; bytes: Buffer }> {
  await findInstrument(db, actor, instrumentId);
  const [photo] = await db
    .select()
    .from(instrumentPhotos)
    .where(and(eq(instrumentPhotos.id, photoId), eq(instrumentPhotos.instrumentId, instrumentId)));
  if (!photo) throw notFound('That photo');
  const bytes = await fs.readFile(path.join(photoFolder(dataDir), photo.fileName)).catch(() => {
    throw notFound('That photo');
  });
  return { contentType: photo.contentType, bytes };
}
