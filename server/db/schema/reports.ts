import { boolean, index, integer, jsonb, pgTable, smallint, text } from 'drizzle-orm/pg-core';
import { identity, timestamps, version, moment, day } from './columns';
import { reportKinds, type ReportTarget } from '../../../shared/api/report';
import { actedBy } from './people';
import { schools } from './schools';

/**
 * One report that went out (or was queued), with the figures it carried, so the next one can
 * show the change since.
 */
export const reportRuns = pgTable(
  'report_runs',
  {
    ...identity,
    kind: text('kind', { enum: reportKinds }).notNull(),
    /** The school of a director report; null for the district summary. */
    schoolId: integer('school_id').references(() => schools.id, { onDelete: 'set null' }),
    periodFrom: day('period_from').notNull(),
    periodTo: day('period_to').notNull(),
    figures: jsonb('figures').notNull(),
    recipients: text('recipients').array().notNull().default([]),
    outboxMessageIds: integer('outbox_message_ids').array().notNull().default([]),
    scheduleId: integer('schedule_id'),
    sentBy: actedBy('sent_by'),
    ...timestamps,
  },
  (table) => [
    index('report_runs_kind_school_idx').on(table.kind, table.schoolId, table.createdAt),
    index('report_runs_created_idx').on(table.createdAt),
  ],
);

/** A report that goes out by itself on a cron schedule in a time zone. */
export const reportSchedules = pgTable(
  'report_schedules',
  {
    ...identity,
    kind: text('kind', { enum: reportKinds }).notNull(),
    /** Five-field cron expression, such as `0 7 * * 1` (Mondays at 07:00). */
    cron: text('cron').notNull(),
    /** IANA time zone the cron expression is read in, such as America/Los_Angeles. */
    timeZone: text('time_zone').notNull(),
    target: jsonb('target').$type<ReportTarget>().notNull(),
    /** How many days before the run the report's period starts. */
    periodDays: smallint('period_days').notNull().default(7),
    active: boolean('active').notNull().default(true),
    lastRunAt: moment('last_run_at'),
    nextRunAt: moment('next_run_at'),
    createdBy: actedBy('created_by'),
    ...version,
    ...timestamps,
  },
  (table) => [index('report_schedules_due_idx').on(table.active, table.nextRunAt)],
);
