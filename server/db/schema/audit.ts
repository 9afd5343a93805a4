import { bigint, index, integer, jsonb, pgTable, text } from 'drizzle-orm/pg-core';
import { moment } from './columns';

/** Who changed what and when, with the row before and after. */
export const auditLog = pgTable(
  'audit_log',
  {
    id: bigint('id', { mode: 'number' }).primaryKey().generatedAlwaysAsIdentity(),
    at: moment('at').notNull().defaultNow(),
    userId: integer('user_id'),
    action: text('action').notNull(),
    entity: text('entity').notNull(),
    entityId: text('entity_id').notNull(),
    before: jsonb('before'),
    after: jsonb('after'),
  },
  (table) => [
    index('audit_log_entity_idx').on(table.entity, table.entityId),
    index('audit_log_at_idx').on(table.at),
  ],
);
