import * as z from 'zod';
import { calendarDate, idParameter, plainText, recordId, versionNumber } from './input-rules';

export const reportKinds = ['director', 'district'] as const;
export type ReportKind = (typeof reportKinds)[number];

const isoDate = calendarDate({ message: 'Write the date as YYYY-MM-DD.' });

/** A count with a label, such as students in one ensemble. */
const countRow = z.object({ label: z.string(), students: z.number().int() });

/** A section whose tables may not exist yet answers `available: false`. */
const section = <Shape extends z.ZodRawShape>(shape: Shape) =>
  z.discriminatedUnion('available', [
    z.object({ available: z.literal(true), ...shape }),
    z.object({ available: z.literal(false), reason: z.string() }),
  ]);

/** One student named in a director report's lists. */
export const reportStudentSchema = z.object({
  studentNumber: z.string(),
  name: z.string(),
  grade: z.number().int(),
  rung: z.number().int(),
  benchmarkRung: z.number().int().nullable(),
  lastPassedOn: z.string().nullable(),
  lastPassOffOn: z.string().nullable(),
});
export type ReportStudent = z.infer<typeof reportStudentSchema>;

export const enrolmentSectionSchema = z.object({
  /** Active students of the school. */
  students: z.number().int(),
  byEnsemble: z.array(countRow),
  byInstrument: z.array(countRow),
});

export const ladderSectionSchema = section({
  byRung: z.array(z.object({ rung: z.number().int(), students: z.number().int() })),
  byGrade: z.array(
    z.object({
      grade: z.number().int(),
      students: z.number().int(),
      benchmarkRung: z.number().int().nullable(),
      atOrAbove: z.number().int(),
      /** atOrAbove / students, from 0 to 1; null without a benchmark or students. */
      share: z.number().nullable(),
    }),
  ),
  /** Share of the school's students with a benchmark who are at or above it. */
  share: z.number().nullable(),
});

export const passOffSectionSchema = section({
  heard: z.number().int(),
  passed: z.number().int(),
  students: z.number().int(),
  rows: z.array(
    z.object({
      heardOn: z.string(),
      studentNumber: z.string(),
      name: z.string(),
      requirementCode: z.string(),
      tempo: z.number().int(),
      passed: z.boolean(),
    }),
  ),
});

export const studentListSectionSchema = section({
  rule: z.string(),
  students: z.array(reportStudentSchema),
});

export const fleetSectionSchema = section({
  out: z.number().int(),
  overdue: z.number().int(),
  inRepair: z.number().int(),
  unsigned: z.number().int(),
  loans: z.array(
    z.object({
      assetTag: z.string(),
      instrument: z.string(),
      studentNumber: z.string(),
      student: z.string(),
      checkedOutOn: z.string(),
      dueOn: z.string(),
      overdue: z.boolean(),
      signed: z.boolean(),
    }),
  ),
});

/** Everything a director report shows for one school and period. */
export const directorReportDataSchema = z.object({
  kind: z.literal('director'),
  school: z.object({ id: z.number().int(), code: z.string(), name: z.string() }),
  from: isoDate,
  to: isoDate,
  enrolment: enrolmentSectionSchema,
  ladder: ladderSectionSchema,
  passOffs: passOffSectionSchema,
  stalled: studentListSectionSchema,
  auditionReady: studentListSectionSchema,
  fleet: fleetSectionSchema,
});
export type DirectorReportData = z.infer<typeof directorReportDataSchema>;

/** The headline figures of one school (or the district) that a summary compares over time. */
export const reportFiguresSchema = z.object({
  students: z.number().int(),
  /** Share at or above benchmark, 0 to 1. */
  atOrAboveShare: z.number().nullable(),
  passOffsHeard: z.number().int().nullable(),
  passOffsPassed: z.number().int().nullable(),
  stalled: z.number().int().nullable(),
  auditionReady: z.number().int().nullable(),
  instrumentsOut: z.number().int().nullable(),
  overdue: z.number().int().nullable(),
  inRepair: z.number().int().nullable(),
  unsigned: z.number().int().nullable(),
});
export type ReportFigures = z.infer<typeof reportFiguresSchema>;

/** The district summary: every school's figures side by side, the totals, and the change. */
export const districtReportDataSchema = z.object({
  kind: z.literal('district'),
  from: isoDate,
  to: isoDate,
  schools: z.array(
    z.object({
      id: z.number().int(),
      code: z.string(),
      name: z.string(),
      figures: reportFiguresSchema,
    }),
  ),
  totals: reportFiguresSchema,
  /** The totals of the last district summary sent, to show the change since. */
  previous: z
    .object({ sentAt: z.string(), from: isoDate, to: isoDate, totals: reportFiguresSchema })
    .nullable(),
});
export type DistrictReportData = z.infer<typeof districtReportDataSchema>;

export type ReportData = DirectorReportData | DistrictReportData;

/** `GET /api/reports/preview` query. */
export const reportPreviewQuerySchema = z
  .strictObject({
    kind: z.enum(reportKinds),
    schoolId: idParameter.optional(),
    from: isoDate,
    to: isoDate,
  })
  .refine((query) => query.kind !== 'director' || query.schoolId !== undefined, {
    message: 'A director report needs a schoolId.',
    path: ['schoolId'],
  })
  .refine((query) => query.from <= query.to, {
    message: 'from must not be after to.',
    path: ['to'],
  });
export type ReportPreviewQuery = z.infer<typeof reportPreviewQuerySchema>;

/** What a preview answers. */
export const reportPreviewSchema = z.object({
  html: z.string(),
  text: z.string(),
  data: z.union([directorReportDataSchema, districtReportDataSchema]),
});

/**
 * Who a report goes to: the directors of the chosen schools (or of every school with
 * `'all-directors'`), or the named recipients instead. A director report is one per school.
 */
export const reportTargetSchema = z
  .strictObject({
    schoolIds: z
      .union([z.literal('all-directors'), z.array(recordId()).min(1).max(500)])
      .optional(),
    recipients: z.array(z.email()).min(1).max(100).optional(),
  })
  .refine((target) => target.schoolIds !== undefined || target.recipients !== undefined, {
    message: "Choose schools, 'all-directors' or recipients.",
    path: ['schoolIds'],
  });
export type ReportTarget = z.infer<typeof reportTargetSchema>;

/** `POST /api/reports/send`: `{ kind, from, to, schoolIds?, recipients?, test? }`. */
export const reportSendInputSchema = z
  .strictObject({
    kind: z.enum(reportKinds),
    from: isoDate,
    to: isoDate,
    schoolIds: reportTargetSchema.shape.schoolIds,
    recipients: reportTargetSchema.shape.recipients,
    /** A test: one message, to the sender alone, its subject marked "Test:". */
    test: z.boolean().optional(),
  })
  .refine((input) => input.from <= input.to, {
    message: 'from must not be after to.',
    path: ['to'],
  });
export type ReportSendInput = z.infer<typeof reportSendInputSchema>;

/** What a send answers: the queued messages and the report runs recorded. */
export const reportSendResultSchema = z.object({
  outboxIds: z.array(z.number().int()),
  runIds: z.array(z.number().int()),
});

/** One report that went out, as `GET /api/reports` lists it. */
export const reportRunSchema = z.object({
  id: z.number().int(),
  kind: z.enum(reportKinds),
  schoolId: z.number().int().nullable(),
  schoolCode: z.string().nullable(),
  from: z.string(),
  to: z.string(),
  recipients: z.array(z.string()),
  outboxIds: z.array(z.number().int()),
  scheduleId: z.number().int().nullable(),
  sentBy: z.number().int().nullable(),
  createdAt: z.string(),
});
export type ReportRun = z.infer<typeof reportRunSchema>;

/** A report schedule as the API answers it. */
export const reportScheduleSchema = z.object({
  id: z.number().int(),
  kind: z.enum(reportKinds),
  cron: z.string(),
  timeZone: z.string(),
  target: reportTargetSchema,
  periodDays: z.number().int(),
  active: z.boolean(),
  lastRunAt: z.string().nullable(),
  nextRunAt: z.string().nullable(),
  version: z.number().int(),
});
export type ReportSchedule = z.infer<typeof reportScheduleSchema>;

const scheduleFields = z.strictObject({
  kind: z.enum(reportKinds),
  /** Five-field cron expression, read in `timeZone`: `0 7 * * 1` is Mondays at 07:00. */
  cron: plainText().min(9).max(100),
  /** IANA time zone name. */
  timeZone: plainText().min(1).max(64),
  target: reportTargetSchema,
  /** The report covers the `periodDays` days up to the run. */
  periodDays: z.number().int().min(1).max(366),
  active: z.boolean(),
});

/** What a form sends to create a schedule. */
export const reportScheduleInputSchema = scheduleFields.extend({
  timeZone: scheduleFields.shape.timeZone.default('America/Los_Angeles'),
  periodDays: scheduleFields.shape.periodDays.default(7),
  active: scheduleFields.shape.active.default(true),
});
export type ReportScheduleInput = z.infer<typeof reportScheduleInputSchema>;

/** A schedule PATCH: any fields, plus the version the editor started from. */
export const reportSchedulePatchSchema = scheduleFields
  .partial()
  .extend({ version: versionNumber });
export type ReportSchedulePatch = z.infer<typeof reportSchedulePatchSchema>;
