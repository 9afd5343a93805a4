import * as z from 'zod';
import { schoolRowFields, studentNameFields } from './fields';
import { calendarDate, idParameter } from './input-rules';

/** Filters of `GET /api/analytics/year-over-year`. */
export const yearOverYearQuerySchema = z.strictObject({
  /** The year compared with the one before it (default: the current year). */
  schoolYearId: idParameter.optional(),
  schoolId: idParameter.optional(),
  /**
   * The day the rung-by-grade figure is read at (default: today, or the compared year's last
   * day once it has ended).
   */
  asOf: calendarDate().optional(),
});
export type YearOverYearQuery = z.infer<typeof yearOverYearQuerySchema>;

const yearRef = z.object({ id: z.number().int(), name: z.string() });

/** How many of last year's players (still in the district) play this year. */
const retentionCount = z.object({
  /** Played last year and did not graduate or leave the district. */
  players: z.number().int(),
  /** Of them, play this year. */
  continued: z.number().int(),
  /** 0–1; null when there were no players. */
  share: z.number().nullable(),
});

/** The median rung of one grade's students on one day, and how many students that is. */
const rungMedian = z.object({
  /** Median (the mean of the two middle rungs for an even count); null when no students. */
  median: z.number().nullable(),
  students: z.number().int(),
});

/**
 * Rung by grade, this year against last year at the same point of the year: the compared year's
 * students of each grade on `asOf` (`day` days after its first day), against the year before's
 * students of that grade `day` days after that year's first day (`previousAsOf`).
 */
export const rungByGradeSchema = z.object({
  asOf: z.string(),
  /** Days after the compared year's first day. */
  day: z.number().int(),
  /** The same day of the year before; null when there is no year before. */
  previousAsOf: z.string().nullable(),
  grades: z.array(z.object({ grade: z.number().int(), current: rungMedian, previous: rungMedian })),
});
export type RungByGrade = z.infer<typeof rungByGradeSchema>;

/** `GET /api/analytics/year-over-year`: retention, the cohorts' climb, and rung by grade. */
export const yearOverYearSchema = z.object({
  year: yearRef,
  /** The year before it; null when there is none yet. */
  previousYear: yearRef.nullable(),
  retention: z.object({
    total: retentionCount,
    /** By the school the students played at last year. */
    bySchool: z.array(retentionCount.extend(schoolRowFields)),
    /** By last year's grade: grade → grade + 1; `changesSchool` where most moved up a school. */
    byTransition: z.array(
      retentionCount.extend({
        fromGrade: z.number().int(),
        toGrade: z.number().int(),
        changesSchool: z.boolean(),
      }),
    ),
  }),
  /**
   * The students whose first year on record is `startYear` (in `startGrade`): their median rung
   * at the end of each year since, and now for the year compared.
   */
  cohorts: z.array(
    z.object({
      startYear: z.string(),
      startGrade: z.number().int(),
      points: z.array(
        z.object({ year: z.string(), median: z.number(), students: z.number().int() }),
      ),
    }),
  ),
  rungByGrade: rungByGradeSchema,
});
export type YearOverYear = z.infer<typeof yearOverYearSchema>;

const booleanQuery = z.preprocess(
  (value) => (value === 'true' ? true : value === 'false' ? false : value),
  z.boolean({ message: 'Use true or false.' }),
);

/** Filters of `GET /api/analytics/retention/students`: the names behind a retention figure. */
export const retentionStudentsQuerySchema = z.strictObject({
  schoolYearId: idParameter.optional(),
  /** Last year's school. */
  schoolId: idParameter.optional(),
  /** Last year's grade. */
  grade: z.coerce.number().int().min(0).max(12).optional(),
  /** true: only those who stopped; false: only those who continued; absent: both. */
  stopped: booleanQuery.optional(),
  offset: z.coerce.number().int().min(0).max(1_000_000).default(0),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});
export type RetentionStudentsQuery = z.infer<typeof retentionStudentsQuerySchema>;

export const retentionStudentSchema = z.object({
  id: z.number().int(),
  ...studentNameFields,
  /** Where and in which grade they played last year. */
  lastSchoolCode: z.string(),
  lastGrade: z.number().int(),
  /** Where they are on the roster now, and their status. */
  schoolCode: z.string(),
  grade: z.number().int(),
  status: z.string(),
  continued: z.boolean(),
});
export type RetentionStudent = z.infer<typeof retentionStudentSchema>;

export const retentionStudentListSchema = z.object({
  rows: z.array(retentionStudentSchema),
  total: z.number().int(),
});
export type RetentionStudentList = z.infer<typeof retentionStudentListSchema>;
