import { index, integer, jsonb, pgTable, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core';
import { users } from './people';
import { students } from './roster';

/**
 * A student's take of a requirement: the recording (a file under the data folder, as pass-off
 * recordings are kept) and what the listening aid heard in it. 'kept' takes are the student's
 * alone; 'sent' takes their directors and the coordinator hear too. Removed by the daily
 * clean-up once the district's retention has passed.
 */
export const takes = pgTable(
  'takes',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    studentId: integer('student_id')
      .notNull()
      .references(() => students.id, { onDelete: 'cascade' }),
    requirementId: text('requirement_id').notNull(),
    tempoAsked: integer('tempo_asked').notNull(),
    storedName: text('stored_name').notNull(),
    contentType: text('content_type').notNull(),
    size: integer('size').notNull(),
    analysis: jsonb('analysis').notNull(),
    status: text('status', { enum: ['kept', 'sent'] })
      .notNull()
      .default('kept'),
    sentAt: timestamp('sent_at', { withTimezone: true, mode: 'date' }),
    /**
     * The director (or coordinator) who recorded the take while hearing the student, kept as
     * evidence of a pass-off; null for the student's own take.
     */
    recordedBy: integer('recorded_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (table) => [
    index('takes_student_idx').on(table.studentId, table.createdAt),
    uniqueIndex('takes_stored_unique').on(table.storedName),
  ],
);
