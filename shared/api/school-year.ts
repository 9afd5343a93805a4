import * as z from 'zod';
import { schoolRowFields } from './fields';

/** A calendar day as the API writes it. */
const day = z
  .string()
  .trim()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'A date is written YYYY-MM-DD.')
  .refine((value) => {
    const parsed = new Date(`${value}T00:00:00Z`);
    return !Number.isNaN(parsed.getTime()) && parsed.toISOString().startsWith(value);
  }, 'That date does not exist.');

/** A school year as the API answers it. */
export const schoolYearSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  startsOn: z.string(),
  endsOn: z.string(),
  /** Whether this is the year the district works in now; exactly one is. */
  current: z.boolean(),
  /** Whether the year is history: it ended before the current one began. */
  past: z.boolean(),
  version: z.number().int(),
});
export type SchoolYear = z.infer<typeof schoolYearSchema>;

export const schoolYearListSchema = z.object({
  rows: z.array(schoolYearSchema),
  total: z.number().int(),
});
export type SchoolYearList = z.infer<typeof schoolYearListSchema>;

const yearName = z
  .string()
  .trim()
  .min(4, 'Name the year, e.g. 2027-28.')
  .max(20, 'A year name is at most 20 characters.');

function datesInOrder(value: { startsOn?: string; endsOn?: string }) {
  return (
    value.startsOn === undefined || value.endsOn === undefined || value.startsOn < value.endsOn
  );
}
const datesInOrderIssue = {
  message: 'The first day comes before the last day.',
  path: ['endsOn'],
};

/** What a form sends to create a school year (not current; a year becomes current by starting it). */
export const schoolYearInputSchema = z
  .object({ name: yearName, startsOn: day, endsOn: day })
  .refine(datesInOrder, datesInOrderIssue);
export type SchoolYearInput = z.infer<typeof schoolYearInputSchema>;

/** What a PATCH sends: any fields, `current: true` to make this the current year, and the version. */
export const schoolYearPatchSchema = z
  .object({
    name: yearName.optional(),
    startsOn: day.optional(),
    endsOn: day.optional(),
    current: z
      .literal(true, { message: 'Make another year current instead: one year is always current.' })
      .optional(),
    version: z.number().int(),
  })
  .refine(datesInOrder, datesInOrderIssue);
export type SchoolYearPatch = z.infer<typeof schoolYearPatchSchema>;

/** What starting a new year asks: its name and dates, and whether ensembles start empty. */
export const yearStartInputSchema = z
  .object({
    name: yearName,
    startsOn: day,
    endsOn: day,
    /** Whether the ensembles carry over without their seats (default: continuing students keep them). */
    emptyEnsembles: z.boolean().default(false),
    /** The preview's `basis`; the commit stops when a roster import landed since. */
    basis: z.number().int().optional(),
  })
  .refine(datesInOrder, datesInOrderIssue);
export type YearStartInput = z.infer<typeof yearStartInputSchema>;

/** The counts of a year start, whole district or one school. */
export const yearStartCountsSchema = z.object({
  /** Active students of the current year. */
  students: z.number().int(),
  /** Up one grade at the same school. */
  promoted: z.number().int(),
  /** Grade 12: off the active rosters, kept with their history. */
  graduated: z.number().int(),
  /** Up one grade into the school their school sends to. */
  movingUp: z.number().int(),
  /** After their school's last grade with no school to move up to. */
  leaving: z.number().int(),
  /** Ensembles carried into the new year. */
  ensembles: z.number().int(),
  /** Seats carried into the new year. */
  seats: z.number().int(),
  /** Open loans carried into the new year. */
  loansCarried: z.number().int(),
  /** Open loans due at or before the old year's last day: the summer return. */
  loansDueBack: z.number().int(),
});
export type YearStartCounts = z.infer<typeof yearStartCountsSchema>;

/** The preview (or the result) of starting a new year. */
export const yearStartResultSchema = yearStartCountsSchema.extend({
  year: z.string(),
  startsOn: z.string(),
  endsOn: z.string(),
  fromYear: z.string(),
  emptyEnsembles: z.boolean(),
  committed: z.boolean(),
  /** The last committed roster import the preview saw; send it back with the commit. */
  basis: z.number().int(),
  schools: z.array(
    yearStartCountsSchema.extend({
      ...schoolRowFields,
      sendsTo: z.string().nullable(),
    }),
  ),
  /** The students it cannot place: after their school's last grade with nowhere to move up. */
  unplaced: z.array(
    z.object({
      studentId: z.number().int(),
      studentNumber: z.string(),
      name: z.string(),
      schoolCode: z.string(),
      grade: z.number().int(),
    }),
  ),
  /** Open loans due back for the summer return. */
  dueBack: z.array(
    z.object({
      loanId: z.number().int(),
      assetTag: z.string(),
      studentName: z.string(),
      schoolCode: z.string(),
      dueOn: z.string(),
    }),
  ),
});
export type YearStartResult = z.infer<typeof yearStartResultSchema>;
