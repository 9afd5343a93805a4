import * as z from 'zod';
import { versionedFields } from './fields';

/** Whether the runtime knows this IANA time zone name (Intl throws a RangeError otherwise). */
export function isKnownTimeZone(timeZone: string): boolean {
  if (!/^[A-Za-z_+-]+(\/[A-Za-z0-9_+-]+)*$/.test(timeZone)) return false;
  try {
    new Intl.DateTimeFormat('en-US', { timeZone });
    return true;
  } catch {
    return false;
  }
}

/** The time zone a new district starts in when `tutti setup` is not told one. */
export const defaultDistrictTimeZone = 'America/Los_Angeles';

/** The district's name: what every page, label and e-mail prints. */
export const districtNameSchema = z
  .string()
  .trim()
  .min(2, 'Give the district its full name.')
  .max(120, 'A district name is at most 120 characters.');

/** An IANA time zone such as America/Denver. */
export const timeZoneSchema = z
  .string()
  .trim()
  .refine(isKnownTimeZone, 'Use an IANA time zone name such as America/Denver.');

/** The district office's lines printed on agreements and labels. */
export const districtContactSchema = z.object({
  address: z.string().trim().max(300),
  phone: z.string().trim().max(60),
  email: z.union([z.literal(''), z.email('The contact e-mail is not an e-mail address.')]),
});
export type DistrictContact = z.infer<typeof districtContactSchema>;

/** The district as `GET /api/district` answers it. */
export const districtSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  shortName: z.string(),
  timeZone: z.string(),
  /** Where the logo is served (no sign-in needed), or null when the district has none. */
  logoUrl: z.string().nullable(),
  contact: districtContactSchema,
  mailSenderName: z.string(),
  ...versionedFields,
});
export type District = z.infer<typeof districtSchema>;

/** What `PATCH /api/district` takes: any of the fields, with the version the editor started from. */
export const districtPatchSchema = z
  .object({
    name: districtNameSchema,
    shortName: z.string().trim().max(40, 'A short name is at most 40 characters.'),
    timeZone: timeZoneSchema,
    contact: districtContactSchema.partial(),
    mailSenderName: z.string().trim().max(80, 'A sender name is at most 80 characters.'),
    /** A new logo as a data URL (PNG or SVG, at most 1 MB), or null to remove it. */
    logo: z.string().max(1_500_000, 'A logo is at most 1 MB.').nullable(),
  })
  .partial()
  .extend({ version: z.number().int() })
  .strict();
export type DistrictPatch = z.infer<typeof districtPatchSchema>;

/** The largest logo the district may upload, in bytes. */
export const logoByteLimit = 1024 * 1024;
