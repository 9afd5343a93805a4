import { randomBytes } from 'node:crypto';
import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { appSettings } from '../db/schema/index';

/** Reads a district setting, or undefined. */
export async function readSetting<Value>(db: Database, key: string): Promise<Value | undefined> {
  const [row] = await db.select().from(appSettings).where(eq(appSettings.key, key));
  return row?.value as Value | undefined;
}

/** Writes a district setting. */
export async function writeSetting(db: Database, key: string, value: unknown): Promise<void> {
  await db
    .insert(appSettings)
    .values({ key, value })
    .onConflictDoUpdate({ target: appSettings.key, set: { value, updatedAt: new Date() } });
}

/**
 * The session-signing secret: SESSION_SECRET when set, else one made once and kept in the
 * database so every app instance and every restart signs alike.
 */
export async function sessionSecret(db: Database, configured?: string): Promise<string> {
  if (configured) return configured;
  await db
    .insert(appSettings)
    .values({ key: 'session-secret', value: randomBytes(32).toString('base64url') })
    .onConflictDoNothing();
  return (await readSetting<string>(db, 'session-secret'))!;
}
