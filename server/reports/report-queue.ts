import { reportRuns } from '../db/schema/index';
import type { Queryable } from './report-tables';
import type { ReportData, ReportKind, ReportTarget } from '@shared/api/report';
import { badRequest } from '../core/errors';
import { enqueueMail } from '../mail/outbox';
import { assembleDirectorReport, assembleDistrictReport, figuresOf } from './report-data';
import { reportSubject } from './report-format';
import { fileNamePrefix, renderReport } from './report-render';
import { districtIdentity } from '../district/district-queries';
import { reportAttachments } from './report-attachments';
import { directorsOf } from './report-recipients';

/** A report to queue: what, for when, to whom, and on whose behalf. */
export interface ReportRequest {
  kind: ReportKind;
  from: string;
  to: string;
  target: ReportTarget;
  /** The user who sent it; null for the scheduler. */
  createdBy: number | null;
  scheduleId?: number | null;
  /** Whether it is a test the sender sends to themselves before it goes out for real. */
  test?: boolean;
}

/** The subject line, marked when the message is a test. */
function subjectOf(request: ReportRequest, subject: string): string {
  return request.test ? `Test: ${subject}` : subject;
}

/** The messages queued and the report runs recorded. */
export interface QueuedReports {
  outboxIds: number[];
  runIds: number[];
}

const unique = (addresses: string[]) => [
  ...new Set(addresses.map((address) => address.toLowerCase())),
];

async function queueDirectorReports(db: Queryable, request: ReportRequest): Promise<QueuedReports> {
  const { target } = request;
  if (target.schoolIds === undefined) {
    throw badRequest('A director report needs schools.', [
      { field: 'schoolIds', message: "Choose schools, or 'all-directors'." },
    ]);
  }
  const directors = await directorsOf(
    db,
    target.schoolIds === 'all-directors' ? 'all' : target.schoolIds,
  );
  const schoolIds =
    target.schoolIds === 'all-directors'
      ? [...new Set(directors.map((director) => director.schoolId))]
      : target.schoolIds;
  const queued: QueuedReports = { outboxIds: [], runIds: [] };
  for (const schoolId of schoolIds) {
    // A test is one school's report: enough to see how it reads.
    if (request.test && queued.outboxIds.length) break;
    const recipients = unique(
      target.recipients ??
        directors
          .filter((director) => director.schoolId === schoolId)
          .map((director) => director.email),
    );
    if (recipients.length === 0) continue;
    const data = await assembleDirectorReport(db, schoolId, request.from, request.to);
    const sent = await sendReport(db, request, recipients, data, {
      fileStem: `${data.school.code}-report`,
      schoolId,
      figures: figuresOf(data),
    });
    queued.outboxIds.push(...sent.outboxIds);
    queued.runIds.push(...sent.runIds);
  }
  return queued;
}

async function queueDistrictSummary(db: Queryable, request: ReportRequest): Promise<QueuedReports> {
  const { target } = request;
  const recipients = unique(
    target.recipients ??
      (
        await directorsOf(
          db,
          target.schoolIds === 'all-directors' ? 'all' : (target.schoolIds ?? []),
        )
      ).map((director) => director.email),
  );
  if (recipients.length === 0) return { outboxIds: [], runIds: [] };
  const data = await assembleDistrictReport(db, request.from, request.to);
  return sendReport(db, request, recipients, data, {
    fileStem: 'district-summary',
    schoolId: null,
    figures: { totals: data.totals, schools: data.schools },
  });
}

/** Where a report run is filed: its attachments' name, its school and the figures it keeps. */
interface RunFiling {
  fileStem: string;
  schoolId: number | null;
  figures: typeof reportRuns.$inferInsert.figures;
}

/**
 * Renders one report and queues a message per recipient, then records the run, the messages
 * and the run in one transaction (a savepoint when `db` is already a transaction).
 */
async function sendReport(
  db: Queryable,
  request: ReportRequest,
  recipients: string[],
  data: ReportData,
  filing: RunFiling,
): Promise<QueuedReports> {
  const district = await districtIdentity(db);
  const rendered = renderReport(data, district?.name);
  const attachments = await reportAttachments(
    `${fileNamePrefix(district?.shortName)}${filing.fileStem}-${data.from}-to-${data.to}`,
    rendered.csvFiles,
  );
  return db.transaction(async (tx) => {
    const outboxIds: number[] = [];
    for (const recipient of recipients) {
      outboxIds.push(
        await enqueueMail(tx, {
          kind: 'report',
          to: [recipient],
          subject: subjectOf(request, reportSubject(data)),
          text: rendered.text,
          html: rendered.html,
          attachments,
          createdBy: request.createdBy,
          ...(filing.schoolId === null ? {} : { schoolId: filing.schoolId }),
        }),
      );
    }
    const [run] = await tx
      .insert(reportRuns)
      .values({
        kind: data.kind,
        ...(filing.schoolId === null ? {} : { schoolId: filing.schoolId }),
        periodFrom: data.from,
        periodTo: data.to,
        figures: filing.figures,
        recipients,
        outboxMessageIds: outboxIds,
        scheduleId: request.scheduleId ?? null,
        sentBy: request.createdBy,
      })
      .returning({ id: reportRuns.id });
    return { outboxIds, runIds: [run!.id] };
  });
}

/**
 * Builds the reports and queues one message per recipient, each school's messages and its
 * report run in one transaction (a savepoint when `db` is already a transaction). Access checks
 * belong to the caller.
 */
export function queueReports(db: Queryable, request: ReportRequest): Promise<QueuedReports> {
  return request.kind === 'director'
    ? queueDirectorReports(db, request)
    : queueDistrictSummary(db, request);
}
