import * as z from 'zod';
import { schoolFields, seatFields, studentFullNameFields, versionedFields } from './fields';
import { idParameter, plainText, recordId, patchSchemaOf } from './input-rules';
import { schoolSummarySchema } from './me';

/** The kinds of ensemble a school runs. */
export const ensembleKinds = [
  'concert-band',
  'symphonic-band',
  'jazz-band',
  'marching-band',
  'string-orchestra',
  'full-orchestra',
  'percussion-ensemble',
  'beginning-band',
  'beginning-strings',
] as const;
export type EnsembleKind = (typeof ensembleKinds)[number];

/** How each kind of ensemble is named on screen. */
export const ensembleKindLabels: Record<EnsembleKind, string> = {
  'concert-band': 'Concert band',
  'symphonic-band': 'Symphonic band',
  'jazz-band': 'Jazz band',
  'marching-band': 'Marching band',
  'string-orchestra': 'String orchestra',
  'full-orchestra': 'Full orchestra',
  'percussion-ensemble': 'Percussion ensemble',
  'beginning-band': 'Beginning band',
  'beginning-strings': 'Beginning strings',
};

/** The fields `GET /api/ensembles?sort=<field>:asc|desc` accepts. */
export const ensembleSortFields = ['name', 'school', 'kind', 'memberCount'] as const;

/** One ensemble as the list and the detail answer it. */
export const ensembleSchema = z.object({
  id: z.number().int(),
  ...schoolFields,
  name: z.string(),
  kind: z.enum(ensembleKinds),
  kindLabel: z.string(),
  /** Free text such as 'beginning', 'intermediate', 'advanced'. */
  level: z.string(),
  meetingPeriod: z.string(),
  directorUserId: z.number().int().nullable(),
  directorName: z.string().nullable(),
  /** Active seats in the current school year. */
  memberCount: z.number().int(),
  ...versionedFields,
});
export type Ensemble = z.infer<typeof ensembleSchema>;

/** One seat of the ensemble in the current school year, with its student. */
export const ensembleMemberSchema = z.object({
  enrollmentId: z.number().int(),
  /** The enrollment's version, for `PATCH /api/enrollments/:enrollmentId`. */
  enrollmentVersion: z.number().int(),
  studentId: z.number().int(),
  ...studentFullNameFields,
  grade: z.number().int(),
  gradeLabel: z.string(),
  ...seatFields,
});
export type EnsembleMember = z.infer<typeof ensembleMemberSchema>;

/**
 * `GET /api/ensembles/:id`: the ensemble, its school and its active seats of the current school
 * year in score order (instrument, then chair, then name).
 */
export const ensembleDetailSchema = ensembleSchema.extend({
  school: schoolSummarySchema,
  members: z.array(ensembleMemberSchema),
});
export type EnsembleDetail = z.infer<typeof ensembleDetailSchema>;

/** What a form sends to add an ensemble (`POST /api/ensembles`). */
export const ensembleInputSchema = z.strictObject({
  schoolId: recordId('Choose the school.'),
  name: plainText().min(2, 'Give the ensemble its name.').max(80),
  kind: z.enum(ensembleKinds, { message: 'Choose the kind of ensemble.' }),
  level: plainText().max(40).default(''),
  meetingPeriod: plainText().max(60).default(''),
  directorUserId: recordId().nullable().default(null),
});
export type EnsembleInput = z.infer<typeof ensembleInputSchema>;

/**
 * What `PATCH /api/ensembles/:id` sends: any fields but the school, plus the version the editor
 * started from.
 */
export const ensemblePatchSchema = patchSchemaOf(
  ensembleInputSchema.omit({ schoolId: true }).shape,
);
export type EnsemblePatch = z.infer<typeof ensemblePatchSchema>;

/** The field filters of `GET /api/ensembles` (besides q, sort, offset, limit). */
export const ensembleFiltersSchema = z.strictObject({
  schoolId: idParameter.optional(),
  kind: z.enum(ensembleKinds).optional(),
  /** Count the members of this school year (default: the current one). */
  schoolYearId: idParameter.optional(),
});
export type EnsembleFilters = z.infer<typeof ensembleFiltersSchema>;
