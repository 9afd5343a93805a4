import { Router } from 'express';
import { and, count, desc, eq, type SQL } from 'drizzle-orm';
import { apiTokenFiltersSchema, apiTokenInputSchema, type ApiToken } from '@shared/api/token';
import { apiTokens, users } from '../db/schema/index';
import { actorOf, can, requires } from '../core/policy';
import { parseId, parseInput } from '../core/validate';
import { parseListQuery } from '../core/list-query';
import { notFound } from '../core/errors';
import { recordAudit } from '../core/audit';
import type { Services } from '../services';
import { issueToken } from './tokens-service';

/**
 * `/api/tokens`: people who may use the API list, create and revoke their own tokens; the
 * coordinator sees and revokes everyone's.
 */
export function tokensRoutes({ db }: Services): Router {
  const router = Router();

  router.get('/tokens', requires('tokens:own'), async (request, response) => {
    const actor = actorOf(request);
    const list = parseListQuery(request.query, apiTokenFiltersSchema);
    const mine: SQL | undefined = and(
      can(actor, 'people:manage') ? undefined : eq(apiTokens.userId, actor.userId),
      list.userId !== undefined ? eq(apiTokens.userId, list.userId) : undefined,
    );
    const rows = await db
      .select({ token: apiTokens, userEmail: users.email })
      .from(apiTokens)
      .innerJoin(users, eq(users.id, apiTokens.userId))
      .where(mine)
      .orderBy(desc(apiTokens.createdAt), desc(apiTokens.id))
      .limit(list.limit)
      .offset(list.offset);
    const [total] = await db.select({ total: count() }).from(apiTokens).where(mine);
    const answer: ApiToken[] = rows.map(({ token, userEmail }) => ({
      id: token.id,
      userId: token.userId,
      userEmail,
      label: token.label,
      createdAt: token.createdAt.toISOString(),
      lastUsedAt: token.lastUsedAt?.toISOString() ?? null,
      revokedAt: token.revokedAt?.toISOString() ?? null,
      expiresAt: token.expiresAt.toISOString(),
    }));
    response.json({ rows: answer, total: total!.total });
  });

  router.post('/tokens', requires('tokens:own'), async (request, response) => {
    const actor = actorOf(request);
    const { label, lifetimeDays } = parseInput(
      apiTokenInputSchema,
      request.body ?? {},
      'The token',
    );
    const { id, token, expiresAt } = await issueToken(db, actor.userId, label, lifetimeDays);
    await recordAudit(db, actor, {
      action: 'create',
      entity: 'api-token',
      entityId: id,
      after: { label, expiresAt: expiresAt.toISOString() },
    });
    response.status(201).json({ id, label, token, expiresAt: expiresAt.toISOString() });
  });

  router.delete('/tokens/:id', requires('tokens:own'), async (request, response) => {
    const actor = actorOf(request);
    const id = parseId(request.params['id']);
    const owned = can(actor, 'people:manage')
      ? eq(apiTokens.id, id)
      : and(eq(apiTokens.id, id), eq(apiTokens.userId, actor.userId));
    const [revoked] = await db
      .update(apiTokens)
      .set({ revokedAt: new Date() })
      .where(owned)
      .returning({ id: apiTokens.id });
    if (!revoked) throw notFound('That token');
    await recordAudit(db, actor, { action: 'revoke', entity: 'api-token', entityId: id });
    response.status(204).end();
  });

  return router;
}
