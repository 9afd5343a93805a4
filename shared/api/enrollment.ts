import * as z from 'zod';
import { schoolRefFields, seatFields, studentFullNameFields, versionedFields } from './fields';
import { idParameter, plainText, recordId, patchSchemaOf } from './input-rules';
import { instruments } from '../music/index';

const instrumentIds = new Set(instruments.map((instrument) => instrument.id));

const instrumentId = z
  .string({ message: 'Choose the instrument.' })
  .trim()
  .refine((id) => instrumentIds.has(id), {
    message: `Instrument is one of: ${[...instrumentIds].join(', ')}.`,
  });

const chair = z
  .number()
  .int('A chair is a whole number.')
  .min(1, 'Chairs count from 1.')
  .max(99, 'Chairs go up to 99.')
  .nullable();

/** The fields `GET /api/enrollments?sort=<field>:asc|desc` accepts. */
export const enrollmentSortFields = [
  'lastName',
  'ensemble',
  'instrument',
  'chair',
  'updatedAt',
] as const;

/** A student's seat in one ensemble for one school year. */
export const enrollmentSchema = z.object({
  id: z.number().int(),
  studentId: z.number().int(),
  ...studentFullNameFields,
  ensembleId: z.number().int(),
  ensembleName: z.string(),
  ...schoolRefFields,
  schoolYearId: z.number().int(),
  schoolYearName: z.string(),
  ...seatFields,
  ...versionedFields,
});
export type Enrollment = z.infer<typeof enrollmentSchema>;

/**
 * `POST /api/enrollments`: seats a student in an ensemble of the same school for the current
 * school year. `instrumentId` is one of the music engine's instrument ids.
 */
export const enrollmentInputSchema = z.strictObject({
  studentId: recordId('Choose the student.'),
  ensembleId: recordId('Choose the ensemble.'),
  instrumentId,
  part: plainText().max(40).default(''),
  chair: chair.default(null),
});
export type EnrollmentInput = z.infer<typeof enrollmentInputSchema>;

/** `PATCH /api/enrollments/:id`: instrument, part, chair or active, plus the version. */
export const enrollmentPatchSchema = patchSchemaOf({
  ...enrollmentInputSchema.omit({ studentId: true, ensembleId: true }).shape,
  active: z.boolean(),
});
export type EnrollmentPatch = z.infer<typeof enrollmentPatchSchema>;

/** The field filters of `GET /api/enrollments`; `active` is 'true' or 'false'. */
export const enrollmentFiltersSchema = z.strictObject({
  schoolId: idParameter.optional(),
  studentId: idParameter.optional(),
  ensembleId: idParameter.optional(),
  schoolYearId: idParameter.optional(),
  active: z
    .enum(['true', 'false'], { message: "active is 'true' or 'false'." })
    .transform((value) => value === 'true')
    .optional(),
});
export type EnrollmentFilters = z.infer<typeof enrollmentFiltersSchema>;
