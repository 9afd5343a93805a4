import { boolean, integer, pgTable, text } from 'drizzle-orm/pg-core';
import { timestamps, version, moment, linkTo } from './columns';
import { schools } from './schools';
import { users } from './people';

/**
 * The school a OneRoster org (by its sourcedId) belongs to, as matched or chosen at an import;
 * every later import, the command line and the REST sync use it.
 */
export const oneRosterOrgSchools = pgTable('oneroster_org_schools', {
  sourcedId: text('sourced_id').primaryKey(),
  /** The org's name when it was mapped, to show in the mapping list. */
  orgName: text('org_name').notNull(),
  schoolId: linkTo('school_id', () => schools.id),
  /** Whether a coordinator chose it (rather than an import matching it by identifier or name). */
  chosen: boolean('chosen').notNull().default(false),
  chosenBy: integer('chosen_by').references(() => users.id),
  ...timestamps,
});

/**
 * The district's OneRoster REST connection (one row): where the provider is, its OAuth 2
 * client, when to sync, and how the last run went. The client secret is kept encrypted.
 */
export const oneRosterSync = pgTable('oneroster_sync', {
  id: integer('id').primaryKey(),
  baseUrl: text('base_url').notNull(),
  /** OneRoster version of the provider's REST binding: '1.1' or '1.2'. */
  apiVersion: text('api_version').notNull().default('1.2'),
  tokenUrl: text('token_url').notNull(),
  clientId: text('client_id').notNull(),
  /** The client secret, AES-256-GCM encrypted with the key in TUTTI_SECRET_KEY. */
  clientSecretEncrypted: text('client_secret_encrypted').notNull(),
  enabled: boolean('enabled').notNull().default(true),
  /** The district-local time of day the nightly sync runs, 'HH:MM'. */
  runAt: text('run_at').notNull().default('02:00'),
  /** The newest dateLastModified seen by the last committed run: the next run asks for later. */
  changedSince: moment('changed_since'),
  lastRunAt: moment('last_run_at'),
  lastOutcome: text('last_outcome'),
  lastError: text('last_error'),
  ...version,
  ...timestamps,
});
