import { z } from 'zod';
import { plainText, versionNumber } from './input-rules';

export const schoolLevels = ['elementary', 'middle', 'high', 'k-8', 'other'] as const;

/** A school as the API answers it. */
export const schoolSchema = z.object({
  id: z.number().int(),
  code: z.string(),
  name: z.string(),
  level: z.enum(schoolLevels),
  address: z.string(),
  version: z.number().int(),
  studentCount: z.number().int().optional(),
  ensembleCount: z.number().int().optional(),
});
export type School = z.infer<typeof schoolSchema>;

/** What a form sends to create a school. */
export const schoolInputSchema = z.strictObject({
  code: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9]{2,10}$/, 'A school code is 2 to 10 letters or digits, e.g. HPMS.'),
  name: plainText().min(2, 'Give the school its full name.').max(120),
  level: z.enum(schoolLevels, { message: 'Level is elementary, middle, high, k-8 or other.' }),
  address: plainText().max(300).default(''),
});
export type SchoolInput = z.infer<typeof schoolInputSchema>;

/** What a PATCH sends: any fields, plus the version the editor started from. */
export const schoolPatchSchema = schoolInputSchema.partial().extend({ version: versionNumber });
