import { date, integer, timestamp, type AnyPgColumn } from 'drizzle-orm/pg-core';

/**
 * Column builders every table reads from, so a column kind is written once (Drizzle ORM,
 * "Column types" and "Indexes & Constraints": identity columns, foreign keys).
 */

/** A point in time, stored with its time zone and read as a `Date`. */
export const moment = (name: string) => timestamp(name, { withTimezone: true, mode: 'date' });

/** A calendar date, read as its ISO 8601 `yyyy-mm-dd` text. */
export const day = (name: string) => date(name, { mode: 'string' });

/** The row id: an identity column the database numbers. */
export const identity = {
  id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
};

/** When a row was written. */
export const created = {
  createdAt: moment('created_at').notNull().defaultNow(),
};

/** Creation and change times every edited table carries. */
export const timestamps = {
  ...created,
  updatedAt: moment('updated_at').notNull().defaultNow(),
};

/** The optimistic-locking counter a PATCH must echo back; a stale one answers 409. */
export const version = {
  version: integer('version').notNull().default(1),
};

/**
 * A required link to another table's row; with `'cascade'` the row goes when the row it
 * belongs to is deleted, otherwise that delete is refused while the link stands.
 */
export const linkTo = (name: string, target: () => AnyPgColumn, onDelete?: 'cascade') =>
  integer(name)
    .notNull()
    .references(target, onDelete ? { onDelete } : {});
