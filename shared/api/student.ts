import * as z from 'zod';
import { schoolFields, seatFields, studentFullNameFields, versionedFields } from './fields';
import { idParameter, plainText, recordId, versionNumber } from './input-rules';
import { listResponseSchema } from './list';
import { schoolSummarySchema } from './me';

/** Whether a student is on the roster now, has left the program, graduated, or left the district's schools after their school's last grade. */
export const studentStatuses = ['active', 'withdrawn', 'graduated', 'leaving'] as const;
export type StudentStatus = (typeof studentStatuses)[number];

/** The fields `GET /api/students?sort=<field>:asc|desc` accepts. */
export const studentSortFields = [
  'lastName',
  'firstName',
  'studentNumber',
  'grade',
  'school',
  'status',
  'updatedAt',
] as const;

/** A grade as a form or roster writes it: 0 or "K" is kindergarten, then 1 to 12. */
const gradeInput = z.preprocess(
  (value) => {
    if (typeof value !== 'string') return value;
    const text = value.trim();
    if (/^k$/i.test(text)) return 0;
    return /^\d{1,2}$/.test(text) ? Number(text) : value;
  },
  z
    .number({ message: 'Grade is K or 1 to 12.' })
    .int('Grade is K or 1 to 12.')
    .min(0, 'Grade is K or 1 to 12.')
    .max(12, 'Grade is K or 1 to 12.'),
);

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max)
    .nullish()
    .transform((value) => (value ? value : null));

/** One student as the list and the detail answer it. */
export const studentSchema = z.object({
  id: z.number().int(),
  ...studentFullNameFields,
  /** 0 is kindergarten. */
  grade: z.number().int(),
  /** 'K', '1' … '12'. */
  gradeLabel: z.string(),
  ...schoolFields,
  status: z.enum(studentStatuses),
  /** Only for the coordinator and directors; absent for everyone else. */
  guardianName: z.string().nullable().optional(),
  /** Only for the coordinator and directors; absent for everyone else. */
  guardianEmail: z.string().nullable().optional(),
  /** The student's current ensembles, names joined with ', '. */
  ensembles: z.string(),
  ensembleIds: z.array(z.number().int()),
  /** The instruments of the current seats, names joined with ', '. */
  instruments: z.string(),
  instrumentIds: z.array(z.string()),
  ...versionedFields,
});
export type Student = z.infer<typeof studentSchema>;
/** A page of students, as `GET /students` answers. */
export const studentListSchema = listResponseSchema(studentSchema);

/** A seat of the student in one ensemble, as the student detail shows it. */
export const studentEnrollmentSchema = z.object({
  id: z.number().int(),
  ensembleId: z.number().int(),
  ensembleName: z.string(),
  schoolYearId: z.number().int(),
  schoolYearName: z.string(),
  ...seatFields,
  version: z.number().int(),
});
export type StudentEnrollment = z.infer<typeof studentEnrollmentSchema>;

/** One move of the student from one school to another. */
export const schoolMoveSchema = z.object({
  id: z.number().int(),
  fromSchool: schoolSummarySchema.nullable(),
  toSchool: schoolSummarySchema,
  /** ISO 8601 time of the move. */
  movedAt: z.string(),
  movedByName: z.string().nullable(),
});
export type SchoolMove = z.infer<typeof schoolMoveSchema>;

/** One past school year of a student: where they were, their ensembles, their rung at its end. */
export const studentYearSchema = z.object({
  schoolYearId: z.number().int(),
  year: z.string(),
  schoolCode: z.string(),
  schoolName: z.string(),
  grade: z.number().int(),
  /** How the year ended for them: promoted, moving-up, graduated, leaving or withdrawn. */
  outcome: z.string(),
  ensembles: z.array(z.string()),
  rung: z.number().int(),
});
export type StudentYear = z.infer<typeof studentYearSchema>;

/**
 * `GET /api/students/:id`: the row plus its school, current seats, moves (newest first) and
 * past school years (newest first).
 */
export const studentDetailSchema = studentSchema.extend({
  school: schoolSummarySchema,
  enrollments: z.array(studentEnrollmentSchema),
  moves: z.array(schoolMoveSchema),
  years: z.array(studentYearSchema),
});
export type StudentDetail = z.infer<typeof studentDetailSchema>;

/** What a form sends to add a student (`POST /api/students`). */
export const studentInputSchema = z.strictObject({
  studentNumber: z
    .string()
    .trim()
    .regex(/^[A-Za-z0-9-]{1,20}$/, 'A student id is 1 to 20 letters, digits or dashes.'),
  firstName: plainText().min(1, 'Give the first name.').max(80),
  lastName: plainText().min(1, 'Give the last name.').max(80),
  preferredName: optionalText(80),
  grade: gradeInput,
  schoolId: recordId('Choose the school.'),
  /** Absent means 'active'. */
  status: z.enum(studentStatuses).optional(),
  guardianName: optionalText(120),
  guardianEmail: z
    .string()
    .trim()
    .max(200)
    .refine((value) => value === '' || z.email().safeParse(value).success, {
      message: 'Give a valid e-mail address, or leave it empty.',
    })
    .nullish()
    .transform((value) => (value ? value.toLowerCase() : null)),
});
export type StudentInput = z.infer<typeof studentInputSchema>;

/**
 * What `PATCH /api/students/:id` sends: any fields but the school (a move is
 * `POST /api/students/:id/move`), plus the version the editor started from. Withdrawing is
 * `{ status: 'withdrawn', version }`.
 */
export const studentPatchSchema = studentInputSchema
  .omit({ schoolId: true })
  .partial()
  .extend({ version: versionNumber });
export type StudentPatch = z.infer<typeof studentPatchSchema>;

/** `POST /api/students/:id/move`: the school the student moves to. */
export const studentMoveSchema = z.strictObject({
  toSchoolId: recordId('Choose the school the student moves to.'),
  version: versionNumber,
});
export type StudentMove = z.infer<typeof studentMoveSchema>;

/** The field filters of `GET /api/students` (besides q, sort, offset, limit). */
export const studentFiltersSchema = z.strictObject({
  schoolId: idParameter.optional(),
  schoolCode: plainText().max(10).optional(),
  grade: gradeInput.optional(),
  status: z.enum(studentStatuses).optional(),
  ensembleId: idParameter.optional(),
  instrumentId: plainText().max(40).optional(),
  /**
   * A past school year: the students who were in the program that year, with that year's
   * school, grade and seats (the current year, or none, lists the roster as it is now).
   */
  schoolYearId: z.coerce.number().int().positive().optional(),
  /**
   * Keyset paging: the cursor in the `Link: <…>; rel="next"` header of the page before. The page
   * starts right after that page's last row (in the same sort), and `offset` is not used.
   */
  after: z
    .string()
    .max(1000)
    .regex(/^[A-Za-z0-9_-]+$/, 'The cursor is not one this server gave out.')
    .optional(),
});
export type StudentFilters = z.infer<typeof studentFiltersSchema>;
