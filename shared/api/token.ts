import * as z from 'zod';
import { idParameter, plainText } from './input-rules';

/** An API token as listed: never the token itself. */
export const apiTokenSchema = z.object({
  id: z.number().int(),
  userId: z.number().int(),
  userEmail: z.string(),
  label: z.string(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
  /** ISO 8601 time the token stops working. */
  expiresAt: z.string(),
});
export type ApiToken = z.infer<typeof apiTokenSchema>;

/** How long a new token lasts unless told: 90 days. */
export const defaultTokenLifetimeDays = 90;
/** The longest a token may last: a year. */
export const longestTokenLifetimeDays = 365;

/** `POST /api/tokens`: a label, and how many days the token lasts. */
export const apiTokenInputSchema = z.strictObject({
  label: plainText().max(80, 'Keep the label under 80 characters.').default(''),
  lifetimeDays: z
    .number({ message: 'The lifetime is a whole number of days.' })
    .int('The lifetime is a whole number of days.')
    .min(1, 'A token lasts at least a day.')
    .max(longestTokenLifetimeDays, `A token lasts at most ${longestTokenLifetimeDays} days.`)
    .default(defaultTokenLifetimeDays),
});
export type ApiTokenInput = z.input<typeof apiTokenInputSchema>;

/** The field filters of `GET /api/tokens`: one person's tokens (the coordinator's view). */
export const apiTokenFiltersSchema = z.strictObject({ userId: idParameter.optional() });
