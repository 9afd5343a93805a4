import * as z from 'zod';
import { idParameter, plainText } from './input-rules';

export const outboxKinds = [
  'report',
  'loan-agreement',
  'overdue-reminder',
  'fee-reminder',
  'fee-receipt',
  'other',
] as const;
export const outboxStates = ['queued', 'sending', 'sent', 'failed'] as const;

/** A message in the outbox, as the list answers it (without its parts' bodies). */
export const outboxMessageSchema = z.object({
  id: z.number().int(),
  kind: z.enum(outboxKinds),
  to: z.array(z.string()),
  cc: z.array(z.string()),
  subject: z.string(),
  state: z.enum(outboxStates),
  attempts: z.number().int(),
  nextAttemptAt: z.string(),
  lastError: z.string().nullable(),
  sentAt: z.string().nullable(),
  messageId: z.string().nullable(),
  createdBy: z.number().int().nullable(),
  relatedType: z.string().nullable(),
  relatedId: z.number().int().nullable(),
  schoolId: z.number().int().nullable(),
  attachments: z.array(
    z.object({ filename: z.string(), contentType: z.string(), size: z.number().int() }),
  ),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;

/** One message with its plain-text and HTML parts. */
export const outboxMessageDetailSchema = outboxMessageSchema.extend({
  text: z.string(),
  html: z.string().nullable(),
});
export type OutboxMessageDetail = z.infer<typeof outboxMessageDetailSchema>;

/** The outbox list's own filters, besides q, sort, offset and limit. */
export const outboxFiltersSchema = z.strictObject({
  state: z.enum(outboxStates).optional(),
  kind: z.enum(outboxKinds).optional(),
  schoolId: idParameter.optional(),
  relatedType: plainText().max(60).optional(),
  relatedId: idParameter.optional(),
});
