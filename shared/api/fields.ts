import * as z from 'zod';

/**
 * Runs of fields that many answers share, spread into their `z.object({...})` where the fields
 * stand (zod: "Objects", `.shape` and spreading shapes), so a record's field names and types are
 * written once.
 */

/** The school a row belongs to, by id and short code. */
export const schoolRefFields = { schoolId: z.number().int(), schoolCode: z.string() };

/** The school a row belongs to, by id, short code and name. */
export const schoolFields = { ...schoolRefFields, schoolName: z.string() };

/** The school a breakdown row (by school) is about: its id, short code and name. */
export const schoolRowFields = { schoolId: z.number().int(), code: z.string(), name: z.string() };

/** The school an instrument lives at. */
export const homeSchoolFields = { homeSchoolId: z.number().int(), homeSchoolCode: z.string() };

/** A student as a row names them: the district's student id, then first and last name. */
export const studentNameFields = {
  /** The district's student id from the student information system. */
  studentNumber: z.string(),
  firstName: z.string(),
  lastName: z.string(),
};

/** A student as a row names them, with the name they go by (null when none). */
export const studentFullNameFields = { ...studentNameFields, preferredName: z.string().nullable() };

/** The student a loan, fee or pass-off is about, by id and display name. */
export const studentLinkFields = { studentId: z.number().int(), studentName: z.string() };

/** An edited record's version (for optimistic concurrency) and the ISO 8601 time of its last change. */
export const versionedFields = { version: z.number().int(), updatedAt: z.string() };

/** A seat's instrument (the music engine's id and name), part, chair and whether it is active. */
export const seatFields = {
  instrumentId: z.string().nullable(),
  instrumentName: z.string().nullable(),
  part: z.string(),
  chair: z.number().int().nullable(),
  active: z.boolean(),
};
