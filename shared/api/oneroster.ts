import * as z from 'zod';
import { schoolFields } from './fields';
import { plainText, recordId, versionNumber } from './input-rules';

/** A OneRoster org mapped to one of the district's schools, remembered for later imports. */
export const orgMappingSchema = z.object({
  sourcedId: z.string(),
  orgName: z.string(),
  ...schoolFields,
  /** Whether a coordinator chose it, rather than an import matching it by identifier or name. */
  chosen: z.boolean(),
  updatedAt: z.string(),
});
export type OrgMapping = z.infer<typeof orgMappingSchema>;

/** A OneRoster sourcedId as a body or query carries it: printable, no spaces, at most 255. */
export const sourcedIdInput = z
  .string()
  .trim()
  .min(1, 'Give the org’s sourcedId.')
  .max(255, 'A sourcedId is at most 255 characters.')
  .regex(/^[^\s\p{C}]+$/u, 'A sourcedId has no spaces or control characters.');

/** `PUT /api/oneroster/org-mappings`: the school a coordinator chose for an org. */
export const orgMappingInputSchema = z.strictObject({
  sourcedId: sourcedIdInput,
  orgName: plainText().min(1, 'Give the org’s name.').max(200),
  schoolId: recordId('Choose the school.'),
});
export type OrgMappingInput = z.infer<typeof orgMappingInputSchema>;

/** `DELETE /api/oneroster/org-mappings?sourcedId=…`. */
export const orgMappingKeySchema = z.strictObject({ sourcedId: sourcedIdInput });

/** The REST binding versions the sync speaks. */
export const oneRosterApiVersions = ['1.1', '1.2'] as const;

const httpUrl = (label: string) =>
  z
    .string()
    .trim()
    .max(500, `The ${label} is at most 500 characters.`)
    .refine((value) => {
      try {
        const url = new URL(value);
        return (
          (url.protocol === 'https:' || url.protocol === 'http:') && !url.username && !url.password
        );
      } catch {
        return false;
      }
    }, `The ${label} must be an http or https address, without a user name or password in it.`);

/**
 * The district's OneRoster REST sync as the API shows it. The client secret is never sent back:
 * `hasSecret` says whether one is kept.
 */
export const syncSettingsSchema = z.object({
  configured: z.boolean(),
  baseUrl: z.string(),
  apiVersion: z.enum(oneRosterApiVersions),
  tokenUrl: z.string(),
  clientId: z.string(),
  hasSecret: z.boolean(),
  enabled: z.boolean(),
  runAt: z.string(),
  changedSince: z.string().nullable(),
  lastRunAt: z.string().nullable(),
  lastOutcome: z.string().nullable(),
  lastError: z.string().nullable(),
  version: z.number().int(),
});
export type SyncSettings = z.infer<typeof syncSettingsSchema>;

/**
 * `PUT /api/oneroster/sync`: where the provider is and when to sync. `clientSecret` is required
 * the first time and may be left out later to keep the saved one. `version` is the settings'
 * version as read (absent the first time).
 */
export const syncSettingsInputSchema = z.strictObject({
  baseUrl: httpUrl('base URL'),
  apiVersion: z.enum(oneRosterApiVersions),
  tokenUrl: httpUrl('token URL'),
  clientId: plainText().min(1, 'Give the client id.').max(200),
  clientSecret: z
    .string()
    .min(1, 'Give the client secret.')
    .max(500, 'The client secret is at most 500 characters.')
    .optional(),
  enabled: z.boolean(),
  runAt: z
    .string()
    .regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Give the time of day as HH:MM, e.g. 02:30.'),
  version: versionNumber.optional(),
});
export type SyncSettingsInput = z.infer<typeof syncSettingsInputSchema>;

/** `POST /api/oneroster/sync/run`: run the sync now, or only plan it. */
export const syncRunInputSchema = z.strictObject({
  dryRun: z.boolean().default(false),
  skipInvalid: z.boolean().default(false),
});
