import { createHash, randomBytes } from 'node:crypto';
import { and, eq, isNull } from 'drizzle-orm';
import type { Database } from '../db/client';
import { apiTokens } from '../db/schema/index';

const tokenPrefix = 'tutti_';
const lastUsedResolutionMs = 60_000;

/** The SHA-256 of a token, as stored; the token itself is never kept. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** Makes a new API token for a user and returns it in plain text, once. */
export async function issueToken(db: Database, userId: number, label = '') {
  const token = tokenPrefix + randomBytes(32).toString('base64url');
  const [row] = await db
    .insert(apiTokens)
    .values({ userId, label, tokenHash: hashToken(token) })
    .returning({ id: apiTokens.id });
  return { id: row!.id, token };
}

/** The user a live token belongs to, noting when it was last used; undefined when unknown or revoked. */
export async function resolveToken(db: Database, token: string): Promise<number | undefined> {
  if (!token.startsWith(tokenPrefix) || token.length > 200) return undefined;
  const [row] = await db
    .select()
    .from(apiTokens)
    .where(and(eq(apiTokens.tokenHash, hashToken(token)), isNull(apiTokens.revokedAt)));
  if (!row) return undefined;
  const now = new Date();
  if (!row.lastUsedAt || now.getTime() - row.lastUsedAt.getTime() > lastUsedResolutionMs) {
    await db.update(apiTokens).set({ lastUsedAt: now }).where(eq(apiTokens.id, row.id));
  }
  return row.userId;
}
