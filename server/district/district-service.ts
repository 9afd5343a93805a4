import { z } from 'zod';
import type { Database } from '../db/client';
import { districts, users } from '../db/schema/index';
import {
  defaultDistrictTimeZone,
  districtNameSchema,
  timeZoneSchema,
  type District,
  type DistrictPatch,
} from '@shared/api/district';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import type { Actor } from '../core/policy';
import { updateVersioned } from '../core/versioned-update';
import { checkLogo } from './district-logo';
import {
  findDistrictRow,
  forgetDistrictIdentity,
  toDistrict,
  type DistrictRow,
} from './district-queries';
import { useDistrictTimeZone } from './district-clock';

/** The district, for any signed-in user. */
export async function getDistrict(db: Database): Promise<District> {
  const row = await findDistrictRow(db);
  if (!row) throw notFound('The district');
  return toDistrict(row);
}

// The audit keeps what changed, not the logo's bytes: a fingerprint of them is enough to tell.
function auditView(row: DistrictRow) {
  const { logoData, ...rest } = row;
  return { ...rest, logoBytes: logoData ? Buffer.from(logoData, 'base64').length : 0 };
}

/** Changes the district's settings (coordinator; the route checks), refusing a stale version. */
export async function updateDistrict(
  db: Database,
  actor: Actor,
  patch: DistrictPatch,
): Promise<District> {
  const { version, contact, logo, ...fields } = patch;
  const changes: Partial<DistrictRow> = { ...fields };
  if (contact?.address !== undefined) changes.contactAddress = contact.address;
  if (contact?.phone !== undefined) changes.contactPhone = contact.phone;
  if (contact?.email !== undefined) changes.contactEmail = contact.email;
  const current = await findDistrictRow(db);
  if (!current) throw notFound('The district');
  if (logo !== undefined) {
    const checked = logo === null ? null : checkLogo(logo);
    changes.logoData = checked ? checked.bytes.toString('base64') : null;
    changes.logoType = checked ? checked.type : null;
    changes.logoVersion = current.logoVersion + 1;
  }
  const after = await db.transaction(async (tx) => {
    const updated = await updateVersioned(
      tx,
      districts,
      current.id,
      version,
      changes,
      'The district',
    );
    await recordAudit(tx, actor, {
      action: 'update',
      entity: 'district',
      entityId: current.id,
      before: auditView(current),
      after: auditView(updated),
    });
    return updated;
  });
  forgetDistrictIdentity(db);
  useDistrictTimeZone(after.timeZone);
  return toDistrict(after);
}

/** What `tutti setup` is given. */
export const setupInputSchema = z.object({
  district: districtNameSchema,
  coordinator: z.email('The coordinator e-mail is not an e-mail address.').trim().toLowerCase(),
  coordinatorName: z
    .string()
    .trim()
    .min(2, 'Give the coordinator a name of 2 characters or more.')
    .max(120)
    .optional(),
  timeZone: timeZoneSchema.default(defaultDistrictTimeZone),
});
export type SetupInput = z.input<typeof setupInputSchema>;

/** What setup made. */
export interface SetupResult {
  district: District;
  coordinator: { id: number; email: string; name: string };
}

/** A readable name from an e-mail address: music.office@… → Music Office. */
function nameFromEmail(email: string): string {
  return email
    .split('@')[0]!
    .split(/[._-]+/)
    .filter(Boolean)
    .map((word) => word[0]!.toUpperCase() + word.slice(1))
    .join(' ');
}

/** Thrown when the database already holds a district (or someone who signs in). */
export class AlreadySetUpError extends Error {}

/**
 * Makes the district's record and its first coordinator in one transaction, on a database with
 * no district. Refuses (nothing written) when a district exists, or when people already sign in.
 */
export async function setUpDistrict(db: Database, input: SetupInput): Promise<SetupResult> {
  const parsed = setupInputSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const field =
      {
        district: '--district',
        coordinator: '--coordinator',
        coordinatorName: '--coordinator-name',
        timeZone: '--time-zone',
      }[String(issue.path[0]) as keyof SetupInput] ?? String(issue.path[0]);
    throw badRequest(`${field}: ${issue.message}`, [{ field, message: issue.message }]);
  }
  const { district, coordinator, coordinatorName, timeZone } = parsed.data;
  const result = await db.transaction(async (tx) => {
    const existing = await findDistrictRow(tx);
    if (existing)
      throw new AlreadySetUpError(
        `This Tuttiboard is already set up for ${existing.name}; nothing was changed.`,
      );
    const [someone] = await tx.select({ id: users.id }).from(users).limit(1);
    if (someone)
      throw new AlreadySetUpError(
        'This database already has people who sign in, so it is not a new installation; nothing was changed.',
      );
    const [row] = await tx.insert(districts).values({ name: district, timeZone }).returning();
    const [user] = await tx
      .insert(users)
      .values({
        email: coordinator,
        name: coordinatorName ?? nameFromEmail(coordinator),
        role: 'coordinator',
      })
      .returning({ id: users.id, email: users.email, name: users.name });
    await recordAudit(
      tx,
      null,
      { action: 'create', entity: 'district', entityId: row!.id, after: auditView(row!) },
      { action: 'create', entity: 'user', entityId: user!.id, after: user },
    );
    return { district: toDistrict(row!), coordinator: user! };
  });
  forgetDistrictIdentity(db);
  return result;
}
