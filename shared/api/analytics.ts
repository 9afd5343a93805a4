import * as z from 'zod';
import { schoolRefFields, schoolRowFields, studentLinkFields, studentNameFields } from './fields';
import { calendarDate, idParameter, plainText } from './input-rules';
import { requirementSchema } from './ladder';
import { passOffSchema, recordingSchema } from './pass-off';

/** Where a figure's rows are: the list route and the filters that select them. */
export const drillSchema = z.object({
  path: z.enum(['/api/analytics/students', '/api/pass-offs']),
  query: z.record(z.string(), z.union([z.string(), z.number(), z.boolean()])),
});
export type Drill = z.infer<typeof drillSchema>;

/** Why a student's rung dropped when the ladder in force last changed. */
export const ladderChangeNoteSchema = z.object({
  /** ISO date the version now in force was put in force. */
  changedOn: z.string(),
  previousVersionName: z.string(),
  versionName: z.string(),
  rungBefore: z.number().int(),
  rungAfter: z.number().int(),
  /** Each change that now stands in the student's way: 'G major for strings was added to rung 1'. */
  reasons: z.array(z.string()),
  /** The whole note in one sentence, as the student's page shows it. */
  message: z.string(),
});
export type LadderChangeNote = z.infer<typeof ladderChangeNoteSchema>;

/** `GET /api/analytics/students/:id/progress`: where a student stands on the active ladder. */
export const studentProgressSchema = z.object({
  ...studentLinkFields,
  grade: z.number().int(),
  schoolId: z.number().int(),
  /** The instrument the ladder is read for (the student's current seat), and its family. */
  instrumentId: z.string().nullable(),
  family: z.string().nullable(),
  ladderVersionId: z.number().int(),
  ladderVersionName: z.string(),
  rungCount: z.number().int(),
  /** 0 = none yet. */
  rung: z.number().int(),
  rungTitle: z.string().nullable(),
  /** Codes of the requirements met under the active ladder (optional ones included). */
  metRequirementCodes: z.array(z.string()),
  /** The lowest unfinished rung and its requirements for the student's family still unmet. */
  next: z.object({
    rung: z.number().int().nullable(),
    title: z.string().nullable(),
    requirements: z.array(requirementSchema),
  }),
  /** The benchmark for the student's grade today, when the ladder has one. */
  benchmark: z
    .object({ rung: z.number().int(), byDate: z.string(), atOrAbove: z.boolean() })
    .nullable(),
  /** Every pass-off, newest first, each with how it stands under the active ladder. */
  history: z.array(passOffSchema),
  recordings: z.array(recordingSchema.extend({ passOffId: z.number().int() })),
  /** Plain-language notes on the pass-offs that no longer count. */
  notes: z.array(z.object({ passOffId: z.number().int(), message: z.string() })),
  /** When the last change of the ladder lowered the student's rung: why. */
  ladderChange: ladderChangeNoteSchema.nullable(),
});
export type StudentProgress = z.infer<typeof studentProgressSchema>;

const countsByRung = z.array(z.number().int());

/** How many of a group's students are at or above the benchmark, of how many, and the drill. */
const benchmarkShareFields = {
  atOrAbove: z.number().int(),
  students: z.number().int(),
  /** 0–1; null when the group has no students. */
  share: z.number().nullable(),
  drill: drillSchema,
};

/** `GET /api/analytics/overview`: the ladder figures of the Overview, each with its drill. */
export const overviewSchema = z.object({
  /** The day the figures are read on (ISO date) and the filters applied. */
  asOf: z.string(),
  filters: z.object({
    schoolId: z.number().int().nullable(),
    grade: z.number().int().nullable(),
    ensembleId: z.number().int().nullable(),
  }),
  ladderVersionId: z.number().int().nullable(),
  rungCount: z.number().int(),
  /** Active students in scope. */
  studentCount: z.number().int(),
  /** Students on each rung (index 0 = none yet … rungCount). */
  studentsByRung: z.object({
    rungs: z.array(
      z.object({ rung: z.number().int(), students: z.number().int(), drill: drillSchema }),
    ),
    bySchool: z.array(
      z.object({
        ...schoolRowFields,
        counts: countsByRung,
        drill: drillSchema,
      }),
    ),
    byGrade: z.array(
      z.object({ grade: z.number().int(), counts: countsByRung, drill: drillSchema }),
    ),
  }),
  /** Share of students at or above the benchmark in force today for their grade. */
  benchmark: z.object({
    byGrade: z.array(
      z.object({
        grade: z.number().int(),
        /** The benchmark rung and its date: the latest date not after today, else the first. */
        rung: z.number().int(),
        byDate: z.string(),
        ...benchmarkShareFields,
      }),
    ),
    bySchool: z.array(
      z.object({
        ...schoolRowFields,
        ...benchmarkShareFields,
      }),
    ),
  }),
  medianRungByGrade: z.array(
    z.object({
      grade: z.number().int(),
      median: z.number(),
      students: z.number().int(),
      drill: drillSchema,
    }),
  ),
  /** Pass-offs heard each week (weeks start on Monday) of the current school year. */
  passOffsPerWeek: z.array(
    z.object({
      weekStart: z.string(),
      heard: z.number().int(),
      passed: z.number().int(),
      drill: drillSchema,
    }),
  ),
  /** Active students with no pass-off for `days` days (none at all counts as stalled). */
  stalled: z.object({ days: z.number().int(), students: z.number().int(), drill: drillSchema }),
  /** Directors of the schools in scope who entered no pass-off for `days` days. */
  quietDirectors: z.object({
    days: z.number().int(),
    directors: z.array(
      z.object({
        userId: z.number().int(),
        name: z.string(),
        email: z.string(),
        lastEntryOn: z.string().nullable(),
        schoolCodes: z.array(z.string()),
      }),
    ),
  }),
});
export type Overview = z.infer<typeof overviewSchema>;

const booleanQuery = z.preprocess(
  (value) => (value === 'true' ? true : value === 'false' ? false : value),
  z.boolean({ message: 'Use true or false.' }),
);

/** Filters of `GET /api/analytics/overview`. */
export const overviewQuerySchema = z.strictObject({
  schoolId: idParameter.optional(),
  grade: z.coerce.number().int().min(0).max(12).optional(),
  ensembleId: idParameter.optional(),
  /** Days without a pass-off before a student counts as stalled (default 30). */
  stalledDays: z.coerce.number().int().min(1).max(365).default(30),
  /** Days without an entry before a director counts as quiet (default 30). */
  quietDays: z.coerce.number().int().min(1).max(365).default(30),
  /** Read the figures as on this day (ISO date); default today. */
  asOf: calendarDate().optional(),
});
export type OverviewQuery = z.infer<typeof overviewQuerySchema>;

/** The fields `GET /api/analytics/students?sort=<field>:asc|desc` accepts. */
export const attainmentSortFields = [
  'lastName',
  'grade',
  'school',
  'rung',
  'metCount',
  'lastPassedOn',
  'lastPassOffOn',
] as const;

/** The field filters of `GET /api/analytics/students` (besides q, sort, offset, limit). */
export const attainmentFiltersSchema = z.strictObject({
  rung: z.coerce.number().int().min(0).max(50).optional(),
  schoolId: idParameter.optional(),
  grade: z.coerce.number().int().min(0).max(12).optional(),
  ensembleId: idParameter.optional(),
  belowBenchmark: booleanQuery.optional(),
  atOrAboveBenchmark: booleanQuery.optional(),
  /** Only students with no pass-off for this many days. */
  stalledDays: z.coerce.number().int().min(1).max(365).optional(),
  asOf: calendarDate().optional(),
});
export type AttainmentFilters = z.infer<typeof attainmentFiltersSchema>;

/** One student's standing on the active ladder, as the drill-down lists answer it. */
export const attainmentRowSchema = z.object({
  /** The student's id. */
  id: z.number().int(),
  ...studentNameFields,
  grade: z.number().int(),
  ...schoolRefFields,
  rung: z.number().int(),
  metCount: z.number().int(),
  /** ISO dates, or null when never. */
  lastPassedOn: z.string().nullable(),
  lastPassOffOn: z.string().nullable(),
  /** The benchmark rung for the student's grade today, or null when there is none. */
  benchmarkRung: z.number().int().nullable(),
});
export type AttainmentRow = z.infer<typeof attainmentRowSchema>;

/** The field filters of `GET /api/analytics/audition-ready`. */
export const auditionReadyFiltersSchema = z.strictObject({
  requirementCodes: z.preprocess(
    (value) =>
      typeof value === 'string'
        ? value
            .split(',')
            .map((code) => code.trim())
            .filter(Boolean)
        : value,
    z.array(plainText().max(60)).min(1, 'Choose at least one requirement.').max(60),
  ),
  /** Each of them passed at this tempo or faster (default: each requirement's own tempo). */
  minTempo: z.coerce.number().int().min(20).max(300).optional(),
  schoolId: idParameter.optional(),
  grade: z.coerce.number().int().min(0).max(12).optional(),
});
export type AuditionReadyFilters = z.infer<typeof auditionReadyFiltersSchema>;

/** One student ready for an audition: their best tempo on each chosen requirement. */
export const auditionReadyRowSchema = attainmentRowSchema
  .pick({
    id: true,
    studentNumber: true,
    firstName: true,
    lastName: true,
    grade: true,
    schoolId: true,
    schoolCode: true,
    rung: true,
  })
  .extend({ bestTempos: z.record(z.string(), z.number().int()) });
export type AuditionReadyRow = z.infer<typeof auditionReadyRowSchema>;
