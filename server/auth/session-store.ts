import session from 'express-session';
import { eq, lt, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { sessions } from '../db/schema/index';

const fallbackLifetimeMs = 8 * 60 * 60 * 1000;

/** An express-session store on the `sessions` table, so several app instances share sign-ins. */
export class DatabaseSessionStore extends session.Store {
  constructor(private readonly db: Database) {
    super();
  }

  override get(sid: string, callback: (error: unknown, data?: session.SessionData | null) => void) {
    this.db
      .select()
      .from(sessions)
      .where(eq(sessions.sid, sid))
      .then(([row]) => {
        if (!row || row.expiresAt.getTime() < Date.now()) return callback(null, null);
        callback(null, row.data as session.SessionData);
      }, callback);
  }

  override set(sid: string, data: session.SessionData, callback?: (error?: unknown) => void) {
    const expiresAt = data.cookie?.expires
      ? new Date(data.cookie.expires)
      : new Date(Date.now() + fallbackLifetimeMs);
    this.db
      .insert(sessions)
      .values({ sid, data, expiresAt })
      .onConflictDoUpdate({ target: sessions.sid, set: { data, expiresAt } })
      .then(
        () => callback?.(),
        (error: unknown) => callback?.(error),
      );
  }

  override destroy(sid: string, callback?: (error?: unknown) => void) {
    this.db
      .delete(sessions)
      .where(eq(sessions.sid, sid))
      .then(
        () => callback?.(),
        (error: unknown) => callback?.(error),
      );
  }

  override touch(sid: string, data: session.SessionData, callback?: () => void) {
    const expiresAt = data.cookie?.expires
      ? new Date(data.cookie.expires)
      : new Date(Date.now() + fallbackLifetimeMs);
    this.db
      .update(sessions)
      .set({ expiresAt })
      .where(eq(sessions.sid, sid))
      .then(
        () => callback?.(),
        () => callback?.(),
      );
  }

  /** Deletes sessions past their expiry. */
  async prune(): Promise<void> {
    await this.db.delete(sessions).where(lt(sessions.expiresAt, sql`now()`));
  }
}
