import { and, eq, lte, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { reportSchedules } from '../db/schema/index';
import type { Services } from '../services';
import { queueReports } from './report-queue';
import { nextRunAfter, scheduledPeriod } from './schedule-times';
import { startIntervalJob, type IntervalJob } from '../core/interval-job';

/** What one scheduler tick did. */
export interface SchedulerTick {
  /** The schedules this tick ran. */
  ran: number[];
  outboxIds: number[];
}

/**
 * Runs every active schedule that is due at `now`, once. A run missed while the server was down
 * runs once when it is back (the next run is computed from now, never from the missed time). The
 * run is claimed by moving `next_run_at` on with a WHERE on its old value, in the same
 * transaction as the messages it queues: a second tick or instance finds nothing to claim, and a
 * failed run rolls back and is tried at the next tick.
 */
export async function runDueSchedules(db: Database, now = new Date()): Promise<SchedulerTick> {
  const due = await db
    .select()
    .from(reportSchedules)
    .where(and(eq(reportSchedules.active, true), lte(reportSchedules.nextRunAt, now)));
  const tick: SchedulerTick = { ran: [], outboxIds: [] };
  for (const schedule of due) {
    const scheduledFor = schedule.nextRunAt!;
    const next = nextRunAfter(schedule.cron, schedule.timeZone, now);
    const outboxIds = await db.transaction(async (tx) => {
      const claimed = await tx
        .update(reportSchedules)
        .set({ nextRunAt: next, lastRunAt: now, updatedAt: now })
        .where(
          and(
            eq(reportSchedules.id, schedule.id),
            eq(reportSchedules.active, true),
            sql`${reportSchedules.nextRunAt} = ${scheduledFor.toISOString()}::timestamptz`,
          ),
        )
        .returning({ id: reportSchedules.id });
      if (claimed.length === 0) return null;
      const period = scheduledPeriod(scheduledFor, schedule.timeZone, schedule.periodDays);
      const queued = await queueReports(tx, {
        kind: schedule.kind,
        ...period,
        target: schedule.target,
        createdBy: schedule.createdBy,
        scheduleId: schedule.id,
      });
      return queued.outboxIds;
    });
    if (outboxIds) {
      tick.ran.push(schedule.id);
      tick.outboxIds.push(...outboxIds);
    }
  }
  return tick;
}

/** A running report scheduler. */
export type ReportScheduler = IntervalJob;

/** Checks the schedules a second after the start and then every `intervalMilliseconds` (default 30 s). */
export function startReportScheduler(
  services: Services,
  options: { intervalMilliseconds?: number } = {},
): ReportScheduler {
  return startIntervalJob({
    run: () => runDueSchedules(services.db),
    intervalMilliseconds: options.intervalMilliseconds ?? 30_000,
    firstAfterMilliseconds: 1000,
    onError: (error) => services.logger.warn({ err: error }, 'a report schedule could not run'),
  });
}
