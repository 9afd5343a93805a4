import * as z from 'zod';
import { capabilities } from './capabilities';
import { roles } from './roles';

export const roleSchema = z.enum(roles);

export const schoolSummarySchema = z.object({
  id: z.number().int(),
  code: z.string(),
  name: z.string(),
});
export type SchoolSummary = z.infer<typeof schoolSummarySchema>;

/** Who is signed in, their role, and the schools they act for. */
export const meSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  /** Whether the user sees every school (coordinator, technician). */
  allSchools: z.boolean(),
  schools: z.array(schoolSummarySchema),
  studentId: z.number().int().nullable(),
  capabilities: z.array(z.enum(capabilities)),
});
export type Me = z.infer<typeof meSchema>;
