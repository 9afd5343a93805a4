import { z } from 'zod';
import { plainText } from './input-rules';

/** An API token as listed: never the token itself. */
export const apiTokenSchema = z.object({
  id: z.number().int(),
  userId: z.number().int(),
  userEmail: z.string(),
  label: z.string(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type ApiToken = z.infer<typeof apiTokenSchema>;

export const apiTokenInputSchema = z.strictObject({
  label: plainText().max(80, 'Keep the label under 80 characters.').default(''),
});
