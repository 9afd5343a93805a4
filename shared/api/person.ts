import * as z from 'zod';
import { plainText, recordId, versionNumber } from './input-rules';
import { roleSchema, schoolSummarySchema } from './me';
import { roles, type Role } from './roles';

/** The fields `GET /api/users?sort=<field>:asc|desc` accepts. */
export const personSortFields = ['name', 'email', 'role', 'lastSignInAt'] as const;

/** Roles that act for assigned schools and so need at least one. */
export const schoolBoundRoles: readonly Role[] = ['director', 'viewer'];

/** Whether a role works for assigned schools (director, viewer) rather than district-wide. */
export function needsSchools(role: Role): boolean {
  return schoolBoundRoles.includes(role);
}

/** A role's school and student rules broken by a person, as a form shows them. */
export interface AssignmentProblem {
  field: 'schoolIds' | 'studentId';
  message: string;
}

/**
 * What is wrong with a person's schools and student link for their role; empty when it fits.
 * Directors and viewers act for at least one school; coordinators and technicians work
 * district-wide; a student account belongs to one roster row and takes its school from it.
 */
export function assignmentProblems(person: {
  role: Role;
  schoolIds: readonly number[];
  studentId: number | null | undefined;
}): AssignmentProblem[] {
  const problems: AssignmentProblem[] = [];
  const { role, schoolIds, studentId } = person;
  if (role === 'director' && schoolIds.length === 0) {
    problems.push({
      field: 'schoolIds',
      message: 'A director acts for at least one school: choose their schools.',
    });
  }
  if (role === 'viewer' && schoolIds.length === 0) {
    problems.push({
      field: 'schoolIds',
      message: 'A viewer reads at least one school: choose their schools.',
    });
  }
  if ((role === 'coordinator' || role === 'technician') && schoolIds.length > 0) {
    problems.push({
      field: 'schoolIds',
      message: `A ${role} works district-wide: leave the schools empty.`,
    });
  }
  if (role === 'student' && schoolIds.length > 0) {
    problems.push({
      field: 'schoolIds',
      message:
        'A student account takes its school from the student’s roster row: leave the schools empty.',
    });
  }
  if (role === 'student' && (studentId === null || studentId === undefined)) {
    problems.push({
      field: 'studentId',
      message: 'A student account belongs to a student on the roster: choose the student.',
    });
  }
  if (role !== 'student' && studentId !== null && studentId !== undefined) {
    problems.push({
      field: 'studentId',
      message: 'Only a student account links to a student on the roster.',
    });
  }
  return problems;
}

/** The roster row a student account belongs to. */
export const linkedStudentSchema = z.object({
  id: z.number().int(),
  studentNumber: z.string(),
  name: z.string(),
  schoolId: z.number().int(),
});
export type LinkedStudent = z.infer<typeof linkedStudentSchema>;

/** Someone who signs in, as the People list shows them. */
export const personSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  active: z.boolean(),
  /** The schools a director or viewer acts for (a student's own school); empty district-wide. */
  schools: z.array(schoolSummarySchema),
  /** A student account's roster row. */
  student: linkedStudentSchema.nullable(),
  /** ISO 8601 time of the last sign-in; null when they never signed in. */
  lastSignInAt: z.string().nullable(),
  version: z.number().int(),
  createdAt: z.string(),
});
export type Person = z.infer<typeof personSchema>;

/** How many API tokens a person holds and when one was last used. */
export const tokenSummarySchema = z.object({
  live: z.number().int(),
  revoked: z.number().int(),
  lastUsedAt: z.string().nullable(),
});
export type TokenSummary = z.infer<typeof tokenSummarySchema>;

/** One person with their API tokens summed up. */
export const personDetailSchema = personSchema.extend({ tokens: tokenSummarySchema });
export type PersonDetail = z.infer<typeof personDetailSchema>;

const schoolIdsInput = z
  .array(recordId(), { message: 'Schools are a list of school ids.' })
  .max(200)
  .transform((ids) => [...new Set(ids)]);

const nameInput = plainText()
  .min(2, 'Give the person’s full name.')
  .max(120, 'Keep the name under 120 characters.');

/** What the add form sends. The server checks the role's school and student rules. */
export const personInputSchema = z.strictObject({
  email: z
    .string({ message: 'Give an e-mail address.' })
    .trim()
    .toLowerCase()
    .pipe(z.email('This is not an e-mail address.').max(254)),
  name: nameInput,
  role: z.enum(roles, { message: 'Role is coordinator, director, technician, viewer or student.' }),
  schoolIds: schoolIdsInput.default([]),
  /** For a student account: the id of the student's roster row. */
  studentId: recordId().nullish(),
});
export type PersonInput = z.input<typeof personInputSchema>;

/** What an edit sends: any of these, with the version the editor started from. */
export const personPatchSchema = z.strictObject({
  name: nameInput.optional(),
  role: personInputSchema.shape.role.optional(),
  active: z.boolean({ message: 'Active is true or false.' }).optional(),
  /** Replaces the school assignments. */
  schoolIds: schoolIdsInput.optional(),
  studentId: recordId().nullish(),
  version: versionNumber,
});
export type PersonPatch = z.input<typeof personPatchSchema>;

/** One entry of the audit log: who changed what, with the row before and after. */
export const auditEntrySchema = z.object({
  id: z.number().int(),
  /** ISO 8601 time of the change. */
  at: z.string(),
  userId: z.number().int().nullable(),
  userName: z.string().nullable(),
  userEmail: z.string().nullable(),
  action: z.string(),
  entity: z.string(),
  entityId: z.string(),
  /** The person's name when the entry is about a person (entity 'user'). */
  entityName: z.string().nullable(),
  before: z.unknown(),
  after: z.unknown(),
});
export type AuditEntryRow = z.infer<typeof auditEntrySchema>;

/** An API token just made: the only time the token itself is shown. */
export const createdTokenSchema = z.object({
  id: z.number().int(),
  label: z.string(),
  token: z.string(),
  /** ISO 8601 time the token stops working. */
  expiresAt: z.string(),
});
export type CreatedToken = z.infer<typeof createdTokenSchema>;
