import { idParameter } from '@shared/api/input-rules';
import { and, count, eq, inArray, sql, type SQL } from 'drizzle-orm';
import type { PgColumn } from 'drizzle-orm/pg-core';
import { z } from 'zod';
import type { Database } from '../db/client';
import { reportRuns, schools } from '../db/schema/index';
import type { ListResponse } from '@shared/api/list';
import {
  reportKinds,
  reportPreviewQuerySchema,
  reportSendInputSchema,
  type ReportData,
  type ReportRun,
} from '@shared/api/report';
import { assertInScope, type Actor } from '../core/policy';
import { forbidden, notFound } from '../core/errors';
import { listPage, orderFor, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { parseInput } from '../core/validate';
import { assembleDirectorReport, assembleDistrictReport } from './report-data';
import { renderReport } from './report-render';
import { districtIdentity } from '../district/district-queries';
import { queueReports, type QueuedReports } from './report-queue';

/** A report as the preview shows it: both parts and the data behind them. */
export async function previewReport(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<{ html: string; text: string; data: ReportData }> {
  const input = parseInput(reportPreviewQuerySchema, query, 'The preview');
  let data: ReportData;
  if (input.kind === 'director') {
    assertInScope(actor, input.schoolId, 'That school');
    data = await assembleDirectorReport(db, input.schoolId!, input.from, input.to);
  } else {
    if (actor.role !== 'coordinator')
      throw forbidden('Only the coordinator reads the district summary.');
    data = await assembleDistrictReport(db, input.from, input.to);
  }
  const { html, text } = renderReport(data, (await districtIdentity(db))?.name);
  return { html, text, data };
}

/**
 * Queues a report. The coordinator sends any report to anyone; a director sends their own
 * schools' director reports to themselves only.
 */
export async function sendReport(
  db: Database,
  actor: Actor,
  body: unknown,
): Promise<QueuedReports> {
  const input = parseInput(reportSendInputSchema, body, 'The report');
  const target = { schoolIds: input.schoolIds, recipients: input.recipients };
  if (actor.role === 'director') {
    if (input.kind !== 'director' || !Array.isArray(input.schoolIds)) {
      throw forbidden('A director sends their own schools’ director reports only.');
    }
    const others = (input.recipients ?? []).filter(
      (address) => address.toLowerCase() !== actor.email.toLowerCase(),
    );
    if (others.length) throw forbidden('A director sends reports to themselves only.');
    for (const schoolId of input.schoolIds) assertInScope(actor, schoolId, 'That school');
    target.recipients = [actor.email];
  } else if (actor.role !== 'coordinator') {
    throw forbidden('Your role does not send reports.');
  }
  if (input.test) target.recipients = [actor.email];
  const queued = await queueReports(db, {
    kind: input.kind,
    from: input.from,
    to: input.to,
    target,
    createdBy: actor.userId,
    test: input.test ?? false,
  });
  await recordAudit(db, actor, {
    action: input.test ? 'send-test' : 'send',
    entity: 'report',
    entityId: queued.runIds.join(',') || 'none',
    after: {
      kind: input.kind,
      from: input.from,
      to: input.to,
      target,
      outboxIds: queued.outboxIds,
    },
  });
  return queued;
}

const runFilters = z.object({
  kind: z.enum(reportKinds).optional(),
  schoolId: idParameter.optional(),
  scheduleId: idParameter.optional(),
});

const sortable = {
  createdAt: reportRuns.createdAt,
  from: reportRuns.periodFrom,
  to: reportRuns.periodTo,
  kind: reportRuns.kind,
};

function visibleRuns(actor: Actor): SQL | undefined {
  if (actor.role === 'coordinator') return undefined;
  return actor.schoolIds.length ? inArray(reportRuns.schoolId, actor.schoolIds) : sql`false`;
}

const runColumns = {
  id: reportRuns.id,
  kind: reportRuns.kind,
  schoolId: reportRuns.schoolId,
  schoolCode: schools.code,
  from: reportRuns.periodFrom,
  to: reportRuns.periodTo,
  recipients: reportRuns.recipients,
  outboxIds: reportRuns.outboxMessageIds,
  scheduleId: reportRuns.scheduleId,
  sentBy: reportRuns.sentBy,
  createdAt: reportRuns.createdAt,
};

/** The report runs with their schools: {@link runColumns} and the `extra` columns a caller adds. */
function selectRuns<Extra extends Record<string, PgColumn>>(db: Database, extra: Extra) {
  return db
    .select({ ...runColumns, ...extra })
    .from(reportRuns)
    .leftJoin(schools, eq(schools.id, reportRuns.schoolId));
}

const toRun = (row: Omit<ReportRun, 'createdAt'> & { createdAt: Date }): ReportRun => ({
  ...row,
  createdAt: row.createdAt.toISOString(),
});

/** The reports that went out, as the actor may see them: the coordinator all, others their schools'. */
export async function listReportRuns(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<ReportRun>> {
  const list = parseListQuery(query, runFilters);
  const where = and(
    visibleRuns(actor),
    list.kind ? eq(reportRuns.kind, list.kind) : undefined,
    list.schoolId ? eq(reportRuns.schoolId, list.schoolId) : undefined,
    list.scheduleId ? eq(reportRuns.scheduleId, list.scheduleId) : undefined,
  );
  return listPage(
    list,
    orderFor(list.sort, sortable, 'createdAt:desc', reportRuns.id),
    selectRuns(db, {}).where(where).$dynamic(),
    db.select({ total: count() }).from(reportRuns).where(where),
    toRun,
  );
}

/** One report run with the figures it carried. */
export async function getReportRun(
  db: Database,
  actor: Actor,
  id: number,
): Promise<ReportRun & { figures: unknown }> {
  const [row] = await selectRuns(db, { figures: reportRuns.figures }).where(
    and(eq(reportRuns.id, id), visibleRuns(actor)),
  );
  if (!row) throw notFound('That report');
  return toRun(row) as ReportRun & { figures: unknown };
}
