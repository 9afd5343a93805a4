import {
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  uniqueIndex,
  boolean,
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { identity, timestamps, version, moment, linkTo } from './columns';
import { schools } from './schools';

/** Someone who signs in: coordinator, director, technician, viewer or student. */
export const users = pgTable(
  'users',
  {
    ...identity,
    email: text('email').notNull(),
    name: text('name').notNull(),
    role: text('role', {
      enum: ['coordinator', 'director', 'technician', 'viewer', 'student'],
    }).notNull(),
    active: boolean('active').notNull().default(true),
    /** For a student account: the roster row it belongs to. */
    studentId: integer('student_id'),
    lastSignInAt: moment('last_sign_in_at'),
    ...version,
    ...timestamps,
  },
  (table) => [uniqueIndex('users_email_unique').on(table.email)],
);

/**
 * The user who did something to a row (heard, scanned, started…); the row stays, with no one
 * named, when that account is deleted.
 */
export const actedBy = (name: string) =>
  integer(name).references(() => users.id, { onDelete: 'set null' });

/** The schools a director or viewer acts for. */
export const userSchools = pgTable(
  'user_schools',
  {
    userId: linkTo('user_id', () => users.id, 'cascade'),
    schoolId: linkTo('school_id', () => schools.id, 'cascade'),
  },
  (table) => [
    primaryKey({ columns: [table.userId, table.schoolId] }),
    index('user_schools_school_idx').on(table.schoolId),
  ],
);

/** A script's key: only a SHA-256 hash of the token is kept. */
export const apiTokens = pgTable(
  'api_tokens',
  {
    ...identity,
    userId: linkTo('user_id', () => users.id, 'cascade'),
    label: text('label').notNull().default(''),
    tokenHash: text('token_hash').notNull(),
    lastUsedAt: moment('last_used_at'),
    revokedAt: moment('revoked_at'),
    /** When the token stops working; tokens made before lifetimes existed got 90 days. */
    expiresAt: moment('expires_at')
      .notNull()
      .default(sql`now() + interval '90 days'`),
    ...timestamps,
  },
  (table) => [
    uniqueIndex('api_tokens_hash_unique').on(table.tokenHash),
    index('api_tokens_user_idx').on(table.userId),
  ],
);

/** Browser sessions, kept in the database so several app instances can share them. */
export const sessions = pgTable(
  'sessions',
  {
    sid: text('sid').primaryKey(),
    data: jsonb('data').notNull(),
    expiresAt: moment('expires_at').notNull(),
  },
  (table) => [index('sessions_expires_idx').on(table.expiresAt)],
);

/** Small district-wide settings kept in the database, shared by every app instance. */
export const appSettings = pgTable('app_settings', {
  key: text('key').primaryKey(),
  value: jsonb('value').notNull(),
  ...timestamps,
});
