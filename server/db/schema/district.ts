import { check, integer, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { identity, timestamps, version } from './columns';

/**
 * The district that runs this Tuttiboard: its name as every page, label and e-mail prints it,
 * the time zone its days are counted in, and its logo. One row at most (`tutti setup` makes it).
 */
export const districts = pgTable(
  'districts',
  {
    ...identity,
    name: text('name').notNull(),
    shortName: text('short_name').notNull().default(''),
    /** IANA time zone, such as America/Denver. */
    timeZone: text('time_zone').notNull(),
    contactAddress: text('contact_address').notNull().default(''),
    contactPhone: text('contact_phone').notNull().default(''),
    contactEmail: text('contact_email').notNull().default(''),
    /** The display name outgoing mail is sent under. */
    mailSenderName: text('mail_sender_name').notNull().default(''),
    /** The logo's bytes (base64) and media type: image/png or image/svg+xml. */
    logoData: text('logo_data'),
    logoType: text('logo_type'),
    /** Changes whenever the logo does, so its address can be cached. */
    logoVersion: integer('logo_version').notNull().default(0),
    ...version,
    ...timestamps,
  },
  (table) => [
    // One district per installation: every row has the same value of this index.
    uniqueIndex('districts_one_row').on(sql`(true)`),
    check('districts_logo_type', sql`${table.logoType} in ('image/png', 'image/svg+xml')`),
  ],
);
