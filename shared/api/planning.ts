import * as z from 'zod';
import { homeSchoolFields, schoolFields } from './fields';
import { idParameter } from './input-rules';

/** One instrument in the replacement plan, valued by straight-line depreciation. */
export const replacementLineSchema = z.object({
  id: z.number().int(),
  assetTag: z.string(),
  instrumentId: z.string(),
  instrumentName: z.string(),
  family: z.string(),
  ...homeSchoolFields,
  condition: z.string(),
  purchasedOn: z.string(),
  purchaseCostCents: z.number().int(),
  serviceLifeYears: z.number(),
  /** Whole months since purchase. */
  ageMonths: z.number().int(),
  currentValueCents: z.number().int(),
  repairCostCents: z.number().int(),
  /** Repair cost to date over current value; null when the value is 0. */
  repairShareOfValue: z.number().nullable(),
  /** The day the service life ends. */
  replaceBy: z.string(),
  /** Within how many years it is due: 0 now (life over or unserviceable), or 1, 3, 5; null later. */
  dueWithinYears: z.number().int().nullable(),
});
export type ReplacementLine = z.infer<typeof replacementLineSchema>;

/** What to replace within a horizon, at purchase cost, in total and by school. */
export const replacementHorizonSchema = z.object({
  years: z.number().int(),
  count: z.number().int(),
  totalCents: z.number().int(),
  bySchool: z.array(
    z.object({
      schoolId: z.number().int(),
      schoolCode: z.string(),
      count: z.number().int(),
      totalCents: z.number().int(),
    }),
  ),
});

/** The answer of `GET /api/planning/replacement`. */
export const replacementPlanSchema = z.object({
  asOf: z.string(),
  serviceLifeYears: z.record(z.string(), z.number()),
  lines: z.array(replacementLineSchema),
  horizons: z.array(replacementHorizonSchema),
  /** Instruments left out because they have no purchase date or cost. */
  unvalued: z.number().int(),
});
export type ReplacementPlan = z.infer<typeof replacementPlanSchema>;

/** One district-provided instrument kind at one school: players against instruments. */
export const shortageLineSchema = z.object({
  instrumentId: z.string(),
  instrumentName: z.string(),
  /** Active students enrolled this year on it. */
  players: z.number().int(),
  /** Those players who already hold a loan of one. */
  onLoan: z.number().int(),
  /** Instruments of this kind at this school ready to lend. */
  available: z.number().int(),
  shortfall: z.number().int(),
  surplus: z.number().int(),
});

/** A suggested move of instruments from a school with spares to one that lacks them. */
export const transferSuggestionSchema = z.object({
  instrumentId: z.string(),
  instrumentName: z.string(),
  fromSchoolId: z.number().int(),
  fromSchoolCode: z.string(),
  toSchoolId: z.number().int(),
  toSchoolCode: z.string(),
  count: z.number().int(),
  assetTags: z.array(z.string()),
});

/** The answer of `GET /api/planning/shortages`. */
export const shortageReportSchema = z.object({
  districtProvided: z.array(z.string()),
  schools: z.array(
    z.object({
      ...schoolFields,
      lines: z.array(shortageLineSchema),
    }),
  ),
  transfers: z.array(transferSuggestionSchema),
});
export type ShortageReport = z.infer<typeof shortageReportSchema>;

/** The query of `GET /api/planning/replacement`. */
export const replacementQuerySchema = z.strictObject({
  asOf: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/)
    .optional(),
  homeSchoolId: idParameter.optional(),
});
