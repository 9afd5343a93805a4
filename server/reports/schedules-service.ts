import { asc, count, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { reportSchedules } from '../db/schema/index';
import type { ListResponse } from '@shared/api/list';
import type { ReportSchedule, ReportScheduleInput, ReportSchedulePatch } from '@shared/api/report';
import type { Actor } from '../core/policy';
import { notFound } from '../core/errors';
import { listPage, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { insertAudited, updateVersioned } from '../core/versioned-update';
import { z } from 'zod';
import { nextRunAfter } from './schedule-times';

type ScheduleRow = typeof reportSchedules.$inferSelect;

function toSchedule(row: ScheduleRow): ReportSchedule {
  return {
    id: row.id,
    kind: row.kind,
    cron: row.cron,
    timeZone: row.timeZone,
    target: row.target,
    periodDays: row.periodDays,
    active: row.active,
    lastRunAt: row.lastRunAt?.toISOString() ?? null,
    nextRunAt: row.nextRunAt?.toISOString() ?? null,
    version: row.version,
  };
}

/** Every report schedule (the coordinator's; the route checks). */
export async function listSchedules(
  db: Database,
  query: unknown,
): Promise<ListResponse<ReportSchedule>> {
  const list = parseListQuery(query, z.object({}));
  return listPage(
    list,
    [asc(reportSchedules.id)],
    db.select().from(reportSchedules).$dynamic(),
    db.select({ total: count() }).from(reportSchedules),
    toSchedule,
  );
}

/** One schedule. */
export async function getSchedule(db: Database, id: number): Promise<ReportSchedule> {
  const [row] = await db.select().from(reportSchedules).where(eq(reportSchedules.id, id));
  if (!row) throw notFound('That schedule');
  return toSchedule(row);
}

/** Adds a schedule; its first run is the next time its cron expression matches. */
export async function createSchedule(
  db: Database,
  actor: Actor,
  input: ReportScheduleInput,
): Promise<ReportSchedule> {
  // Computed even for an inactive schedule, so a bad expression is refused at once.
  const firstRun = nextRunAfter(input.cron, input.timeZone, new Date());
  const nextRunAt = input.active ? firstRun : null;
  return db.transaction(async (tx) => {
    const row = await insertAudited(
      tx,
      actor,
      reportSchedules,
      { ...input, nextRunAt, createdBy: actor.userId },
      'report-schedule',
    );
    return toSchedule(row);
  });
}

/** Changes a schedule, refusing a stale version; a new cron, zone or activation moves the next run. */
export async function updateSchedule(
  db: Database,
  actor: Actor,
  id: number,
  patch: ReportSchedulePatch,
): Promise<ReportSchedule> {
  const { version, ...changes } = patch;
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(reportSchedules).where(eq(reportSchedules.id, id));
    if (!before) throw notFound('That schedule');
    const merged = { ...before, ...changes };
    const timing =
      changes.cron !== undefined || changes.timeZone !== undefined || changes.active !== undefined;
    const nextRunAt = timing
      ? merged.active
        ? nextRunAfter(merged.cron, merged.timeZone, new Date())
        : null
      : before.nextRunAt;
    const after = await updateVersioned(
      tx,
      reportSchedules,
      id,
      version,
      { ...changes, nextRunAt },
      'That schedule',
    );
    await recordAudit(tx, actor, {
      action: 'update',
      entity: 'report-schedule',
      entityId: id,
      before,
      after,
    });
    return toSchedule(after);
  });
}

/** Removes a schedule; the reports it already sent stay in the list of report runs. */
export async function deleteSchedule(db: Database, actor: Actor, id: number): Promise<void> {
  await db.transaction(async (tx) => {
    const [before] = await tx.delete(reportSchedules).where(eq(reportSchedules.id, id)).returning();
    if (!before) throw notFound('That schedule');
    await recordAudit(tx, actor, {
      action: 'delete',
      entity: 'report-schedule',
      entityId: id,
      before,
    });
  });
}
