import { createHash, randomBytes } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import { rowsOf, type Database } from '../db/client';
import type { Actor } from '../core/policy';
import { actorColumns, actorFromRow, type ActorRow } from '../people/people-queries';
import { apiTokens } from '../db/schema/index';
import { defaultTokenLifetimeDays } from '@shared/api/token';

const tokenPrefix = 'tutti_';
const lastUsedResolutionMs = 60_000;

/** The SHA-256 of a token, as stored; the token itself is never kept. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** Makes a new API token for a user and returns it in plain text, once, with when it expires. */
export async function issueToken(
  db: Database,
  userId: number,
  label = '',
  lifetimeDays = defaultTokenLifetimeDays,
) {
  const token = tokenPrefix + randomBytes(32).toString('base64url');
  const expiresAt = new Date(Date.now() + lifetimeDays * 24 * 60 * 60 * 1000);
  const [row] = await db
    .insert(apiTokens)
    .values({ userId, label, tokenHash: hashToken(token), expiresAt })
    .returning({ id: apiTokens.id });
  return { id: row!.id, token, expiresAt };
}

/**
 * The actor a live token belongs to (an active user), noting when the token was last used (at
 * most once a minute); undefined when the token is unknown, expired or revoked. One statement reads the
 * token, its user and their schools.
 */
export async function resolveToken(db: Database, token: string): Promise<Actor | undefined> {
  if (!token.startsWith(tokenPrefix) || token.length > 200) return undefined;
  const [row] = rowsOf<ActorRow & { token_id: number; last_used_at: string | Date | null }>(
    await db.execute(sql`
      select t.id as token_id, t.last_used_at, ${actorColumns}
      from api_tokens t join users u on u.id = t.user_id
      where t.token_hash = ${hashToken(token)} and t.revoked_at is null and t.expires_at > now()
        and u.active`),
  );
  if (!row) return undefined;
  const now = new Date();
  const lastUsed = row.last_used_at ? new Date(row.last_used_at) : undefined;
  if (!lastUsed || now.getTime() - lastUsed.getTime() > lastUsedResolutionMs) {
    await db.update(apiTokens).set({ lastUsedAt: now }).where(eq(apiTokens.id, row.token_id));
  }
  return actorFromRow(row, 'token');
}
