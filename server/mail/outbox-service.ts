import { and, count, eq, ilike, inArray, or, sql, type SQL } from 'drizzle-orm';
import type { Database } from '../db/client';
import { outboxMessages } from '../db/schema/index';
import type { ListResponse } from '@shared/api/list';
import {
  outboxFiltersSchema,
  type OutboxMessage,
  type OutboxMessageDetail,
} from '@shared/api/outbox';
import type { Actor } from '../core/policy';
import { likePattern, listPage, orderFor, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { HttpError, notFound } from '../core/errors';
import { nudgeOutbox } from './outbox';

type OutboxRow = typeof outboxMessages.$inferSelect;

const sortable = {
  createdAt: outboxMessages.createdAt,
  subject: outboxMessages.subject,
  state: outboxMessages.state,
  kind: outboxMessages.kind,
  sentAt: outboxMessages.sentAt,
  nextAttemptAt: outboxMessages.nextAttemptAt,
  id: outboxMessages.id,
};

/**
 * Which messages the actor may see: the coordinator all of them; a director those about their
 * schools and those they caused. The route lets no other role in.
 */
function visibleTo(actor: Actor): SQL | undefined {
  if (actor.role === 'coordinator') return undefined;
  const own = eq(outboxMessages.createdBy, actor.userId);
  return actor.schoolIds.length ? or(own, inArray(outboxMessages.schoolId, actor.schoolIds)) : own;
}

function toMessage(row: OutboxRow): OutboxMessage {
  return {
    id: row.id,
    kind: row.kind,
    to: row.to,
    cc: row.cc,
    subject: row.subject,
    state: row.state,
    attempts: row.attempts,
    nextAttemptAt: row.nextAttemptAt.toISOString(),
    lastError: row.lastError,
    sentAt: row.sentAt?.toISOString() ?? null,
    messageId: row.messageId,
    createdBy: row.createdBy,
    relatedType: row.relatedType,
    relatedId: row.relatedId,
    schoolId: row.schoolId,
    attachments: row.attachments.map((attachment) => ({
      filename: attachment.filename,
      contentType: attachment.contentType,
      size: Buffer.byteLength(attachment.content, 'base64'),
    })),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** The outbox as the actor may see it, filtered, sorted and paged. */
export async function listOutbox(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<OutboxMessage>> {
  const list = parseListQuery(query, outboxFiltersSchema);
  const conditions: (SQL | undefined)[] = [visibleTo(actor)];
  if (list.q) {
    const pattern = likePattern(list.q);
    conditions.push(
      or(
        ilike(outboxMessages.subject, pattern),
        sql`exists (select 1 from unnest(${outboxMessages.to}) as recipient where lower(recipient) like ${pattern})`,
      ),
    );
  }
  if (list.state) conditions.push(eq(outboxMessages.state, list.state));
  if (list.kind) conditions.push(eq(outboxMessages.kind, list.kind));
  if (list.schoolId) conditions.push(eq(outboxMessages.schoolId, list.schoolId));
  if (list.relatedType) conditions.push(eq(outboxMessages.relatedType, list.relatedType));
  if (list.relatedId) conditions.push(eq(outboxMessages.relatedId, list.relatedId));
  const where = and(...conditions);
  return listPage(
    list,
    orderFor(list.sort, sortable, 'createdAt:desc', outboxMessages.id),
    db.select().from(outboxMessages).where(where).$dynamic(),
    db.select({ total: count() }).from(outboxMessages).where(where),
    toMessage,
  );
}

async function visibleRow(db: Database, actor: Actor, id: number): Promise<OutboxRow> {
  const [row] = await db
    .select()
    .from(outboxMessages)
    .where(and(eq(outboxMessages.id, id), visibleTo(actor)));
  if (!row) throw notFound('That message');
  return row;
}

/** One message with both parts, when the actor may see it. */
export async function getOutboxMessage(
  db: Database,
  actor: Actor,
  id: number,
): Promise<OutboxMessageDetail> {
  const row = await visibleRow(db, actor, id);
  return { ...toMessage(row), text: row.text, html: row.html };
}

/** Puts a failed message back in the queue for another round of tries. */
export async function resendOutboxMessage(
  db: Database,
  actor: Actor,
  id: number,
): Promise<OutboxMessageDetail> {
  await visibleRow(db, actor, id);
  const row = await db.transaction(async (tx) => {
    const [updated] = await tx
      .update(outboxMessages)
      .set({ state: 'queued', attempts: 0, nextAttemptAt: new Date(), updatedAt: new Date() })
      .where(and(eq(outboxMessages.id, id), eq(outboxMessages.state, 'failed')))
      .returning();
    if (!updated) {
      throw new HttpError(409, 'conflict', 'Only a message that failed can be sent again.');
    }
    await recordAudit(tx, actor, {
      action: 'resend',
      entity: 'outbox-message',
      entityId: id,
      after: { state: 'queued' },
    });
    return updated;
  });
  nudgeOutbox();
  return { ...toMessage(row), text: row.text, html: row.html };
}
