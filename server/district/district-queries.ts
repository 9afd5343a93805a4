import type { Database, Transaction } from '../db/client';
import { districts } from '../db/schema/index';
import type { District } from '@shared/api/district';
import { useDistrictTimeZone } from './district-clock';

export type DistrictRow = typeof districts.$inferSelect;

/** Where the district's logo is served, outside /api so sign-in and agreement pages can show it. */
export const logoPath = '/district-logo';

/** The district as the API answers it. */
export function toDistrict(row: DistrictRow): District {
  return {
    id: row.id,
    name: row.name,
    shortName: row.shortName,
    timeZone: row.timeZone,
    logoUrl: row.logoData ? `${logoPath}?v=${row.logoVersion}` : null,
    contact: { address: row.contactAddress, phone: row.contactPhone, email: row.contactEmail },
    mailSenderName: row.mailSenderName,
    version: row.version,
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** The district's record, or undefined before `tutti setup` (or the demo seed) made it. */
export async function findDistrictRow(
  db: Database | Transaction,
): Promise<DistrictRow | undefined> {
  const [row] = await db.select().from(districts).limit(1);
  if (row) useDistrictTimeZone(row.timeZone);
  return row;
}

/** What pages, PDFs and e-mails print about the district. */
export interface DistrictIdentity {
  name: string;
  shortName: string;
  timeZone: string;
  contactLines: string[];
  mailSenderName: string;
  logo?: { type: string; bytes: Buffer; version: number };
}

const cacheMilliseconds = 5_000;
const identities = new WeakMap<object, { at: number; identity: DistrictIdentity | undefined }>();

function identityOf(row: DistrictRow | undefined): DistrictIdentity | undefined {
  if (!row) return undefined;
  return {
    name: row.name,
    shortName: row.shortName || row.name,
    timeZone: row.timeZone,
    contactLines: [row.contactAddress, row.contactPhone, row.contactEmail].filter(Boolean),
    mailSenderName: row.mailSenderName || row.name,
    logo:
      row.logoData && row.logoType
        ? {
            type: row.logoType,
            bytes: Buffer.from(row.logoData, 'base64'),
            version: row.logoVersion,
          }
        : undefined,
  };
}

/**
 * The district's identity for printing, read at most every few seconds (another app instance
 * may have changed it); undefined when the district is not set up yet.
 */
export async function districtIdentity(
  db: Database | Transaction,
): Promise<DistrictIdentity | undefined> {
  const cached = identities.get(db);
  if (cached?.identity && Date.now() - cached.at < cacheMilliseconds) return cached.identity;
  const identity = identityOf(await findDistrictRow(db));
  identities.set(db, { at: Date.now(), identity });
  return identity;
}

/** Drops the cached identity after a change, so the next page prints the new one. */
export function forgetDistrictIdentity(db: Database | Transaction): void {
  identities.delete(db);
}

/** The name printed where a district is expected, before one is set up. */
export const unnamedDistrict = 'Tuttiboard';
