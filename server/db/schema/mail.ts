import { index, integer, jsonb, pgTable, smallint, text } from 'drizzle-orm/pg-core';
import { outboxKinds, outboxStates } from '../../../shared/api/outbox';
import { identity, timestamps, moment } from './columns';
import { actedBy } from './people';
import { schools } from './schools';

/** A file attached to a queued message, its bytes in base64. */
export interface OutboxAttachment {
  filename: string;
  contentType: string;
  /** The file's bytes, base64-encoded. */
  content: string;
  /** Set for an inline image the HTML part shows with `cid:<contentId>`. */
  contentId?: string;
}

/**
 * A message waiting to go out, or one that went. It is written in the same transaction as the
 * change that caused it, and a worker sends it afterwards, retrying with backoff.
 */
export const outboxMessages = pgTable(
  'outbox_messages',
  {
    ...identity,
    kind: text('kind', { enum: outboxKinds }).notNull(),
    to: text('to').array().notNull(),
    cc: text('cc').array().notNull().default([]),
    subject: text('subject').notNull(),
    text: text('text').notNull(),
    html: text('html'),
    attachments: jsonb('attachments').$type<OutboxAttachment[]>().notNull().default([]),
    state: text('state', { enum: outboxStates }).notNull().default('queued'),
    attempts: smallint('attempts').notNull().default(0),
    nextAttemptAt: moment('next_attempt_at').notNull().defaultNow(),
    lastError: text('last_error'),
    sentAt: moment('sent_at'),
    messageId: text('message_id'),
    createdBy: actedBy('created_by'),
    relatedType: text('related_type'),
    relatedId: integer('related_id'),
    /** The school the message is about, for scoping who may see it. */
    schoolId: integer('school_id').references(() => schools.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (table) => [
    index('outbox_messages_due_idx').on(table.state, table.nextAttemptAt),
    index('outbox_messages_related_idx').on(table.relatedType, table.relatedId),
    index('outbox_messages_school_idx').on(table.schoolId),
  ],
);
