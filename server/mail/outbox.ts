import { EventEmitter } from 'node:events';
import type { Database, Transaction } from '../db/client';
import { outboxMessages, type OutboxAttachment } from '../db/schema/index';
import type { outboxKinds } from '@shared/api/outbox';

/** What a queued message is for. */
export type OutboxKind = (typeof outboxKinds)[number];

/** A file to attach: text (UTF-8) or bytes. */
export interface OutboxAttachmentInput {
  filename: string;
  contentType: string;
  content: string | Uint8Array;
  /** Makes it an inline image the HTML part shows with `<img src="cid:…">`. */
  contentId?: string;
}

/** A message to send. */
export interface OutboxMessageInput {
  kind: OutboxKind;
  to: string[];
  cc?: string[];
  subject: string;
  /** The plain-text part; every message has one. */
  text: string;
  /** The HTML part, when there is one. */
  html?: string | null;
  attachments?: OutboxAttachmentInput[];
  /** The user who caused the message; null for the scheduler. */
  createdBy?: number | null;
  /** The record the message is about, such as `{ type: 'loan', id: 12 }`. */
  related?: { type: string; id: number } | null;
  /** The school the message is about: its directors may see it in the outbox. */
  schoolId?: number | null;
}

const nudges = new EventEmitter();
nudges.setMaxListeners(0);

/** Asks the running mail workers to look at the outbox now rather than at their next poll. */
export function nudgeOutbox(): void {
  nudges.emit('nudge');
}

/** Calls `listener` whenever a message is queued in this process; returns how to stop. */
export function onOutboxNudge(listener: () => void): () => void {
  nudges.on('nudge', listener);
  return () => nudges.off('nudge', listener);
}

function storedAttachment(attachment: OutboxAttachmentInput): OutboxAttachment {
  const bytes =
    typeof attachment.content === 'string'
      ? Buffer.from(attachment.content, 'utf8')
      : Buffer.from(attachment.content);
  return {
    filename: attachment.filename,
    contentType: attachment.contentType,
    content: bytes.toString('base64'),
    ...(attachment.contentId ? { contentId: attachment.contentId } : {}),
  };
}

/**
 * Queues a message for the mail worker and answers its outbox id. Pass the transaction of the
 * change the message belongs to: the message then exists exactly when that change committed.
 */
export async function enqueueMail(
  db: Database | Transaction,
  message: OutboxMessageInput,
): Promise<number> {
  if (message.to.length === 0) throw new Error('A message needs at least one recipient.');
  const [row] = await db
    .insert(outboxMessages)
    .values({
      kind: message.kind,
      to: message.to,
      cc: message.cc ?? [],
      subject: message.subject,
      text: message.text,
      html: message.html ?? null,
      attachments: (message.attachments ?? []).map(storedAttachment),
      createdBy: message.createdBy ?? null,
      relatedType: message.related?.type ?? null,
      relatedId: message.related?.id ?? null,
      schoolId: message.schoolId ?? null,
    })
    .returning({ id: outboxMessages.id });
  // The row becomes visible when the caller commits; the worker's short delay covers that.
  nudgeOutbox();
  return row!.id;
}
