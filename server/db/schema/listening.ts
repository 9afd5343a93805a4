import { index, integer, jsonb, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { actedBy } from './people';
import { students } from './roster';
import { identity, created, moment, linkTo } from './columns';

/**
 * A student's take of a requirement: the recording (a file under the data folder, as pass-off
 * recordings are kept) and what the listening aid heard in it. 'kept' takes are the student's
 * alone; 'sent' takes their directors and the coordinator hear too. Removed by the daily
 * clean-up once the district's retention has passed.
 */
export const takes = pgTable(
  'takes',
  {
    ...identity,
    studentId: linkTo('student_id', () => students.id, 'cascade'),
    requirementId: text('requirement_id').notNull(),
    tempoAsked: integer('tempo_asked').notNull(),
    storedName: text('stored_name').notNull(),
    contentType: text('content_type').notNull(),
    size: integer('size').notNull(),
    analysis: jsonb('analysis').notNull(),
    status: text('status', { enum: ['kept', 'sent'] })
      .notNull()
      .default('kept'),
    sentAt: moment('sent_at'),
    /**
     * The director (or coordinator) who recorded the take while hearing the student, kept as
     * evidence of a pass-off; null for the student's own take.
     */
    recordedBy: actedBy('recorded_by'),
    ...created,
  },
  (table) => [
    index('takes_student_idx').on(table.studentId, table.createdAt),
    uniqueIndex('takes_stored_unique').on(table.storedName),
  ],
);
