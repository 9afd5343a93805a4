import * as z from 'zod';
import { plainText, patchSchemaOf } from './input-rules';
import { listResponseSchema } from './list';

export const schoolLevels = ['elementary', 'middle', 'high', 'k-8', 'other'] as const;

/** A school named in a list of choices. */
export type SchoolSummaryRow = { id: number; code: string; name: string };

/** A school as the API answers it. */
export const schoolSchema = z.object({
  id: z.number().int(),
  code: z.string(),
  name: z.string(),
  level: z.enum(schoolLevels),
  address: z.string(),
  /** The lowest and highest grade the school serves; kindergarten is 0. */
  lowestGrade: z.number().int().nullable(),
  highestGrade: z.number().int().nullable(),
  /** The school its students move up to after its highest grade. */
  sendsToSchoolId: z.number().int().nullable(),
  sendsTo: z.object({ id: z.number().int(), code: z.string(), name: z.string() }).nullable(),
  /** The day the school closed (YYYY-MM-DD), or null while it is open. */
  closedOn: z.string().nullable(),
  version: z.number().int(),
  studentCount: z.number().int().optional(),
  ensembleCount: z.number().int().optional(),
});
export type School = z.infer<typeof schoolSchema>;
/** A page of schools, as `GET /schools` answers. */
export const schoolListSchema = listResponseSchema(schoolSchema);

const gradeSchema = z
  .number({ message: 'A grade is a whole number from 0 (kindergarten) to 12.' })
  .int('A grade is a whole number from 0 (kindergarten) to 12.')
  .min(0, 'A grade is a whole number from 0 (kindergarten) to 12.')
  .max(12, 'A grade is a whole number from 0 (kindergarten) to 12.')
  .nullable();

/** The fields a school is made with or changed by. */
const schoolFields = z.strictObject({
  code: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9]{2,10}$/, 'A school code is 2 to 10 letters or digits, e.g. HPMS.'),
  name: plainText().min(2, 'Give the school its full name.').max(120),
  level: z.enum(schoolLevels, { message: 'Level is elementary, middle, high, k-8 or other.' }),
  address: plainText().max(300).default(''),
  lowestGrade: gradeSchema.default(null),
  highestGrade: gradeSchema.default(null),
  sendsToSchoolId: z.number().int().positive().nullable().default(null),
  closedOn: z.iso.date('A closing day is a date, YYYY-MM-DD.').nullable().default(null),
});

function gradesInOrder(school: { lowestGrade?: number | null; highestGrade?: number | null }) {
  return (
    school.lowestGrade === null ||
    school.lowestGrade === undefined ||
    school.highestGrade === null ||
    school.highestGrade === undefined ||
    school.lowestGrade <= school.highestGrade
  );
}
const gradesInOrderMessage = {
  message: 'The lowest grade served is above the highest.',
  path: ['highestGrade'],
};

/** What a form sends to create a school. */
export const schoolInputSchema = schoolFields.refine(gradesInOrder, gradesInOrderMessage);
export type SchoolInput = z.infer<typeof schoolInputSchema>;

/** What a PATCH sends: any fields, plus the version the editor started from. */
export const schoolPatchSchema = patchSchemaOf(schoolFields.shape).refine(
  gradesInOrder,
  gradesInOrderMessage,
);
export type SchoolPatch = z.infer<typeof schoolPatchSchema>;

/** How a grade is written: K for kindergarten, else its number. */
export function gradeLabel(grade: number | null): string {
  return grade === null ? '' : grade === 0 ? 'K' : String(grade);
}

/** The grades a school serves, as "K–5" or "6–8"; empty when not recorded. */
export function gradesServedLabel(school: {
  lowestGrade: number | null;
  highestGrade: number | null;
}): string {
  if (school.lowestGrade === null || school.highestGrade === null) return '';
  return school.lowestGrade === school.highestGrade
    ? gradeLabel(school.lowestGrade)
    : `${gradeLabel(school.lowestGrade)}–${gradeLabel(school.highestGrade)}`;
}
