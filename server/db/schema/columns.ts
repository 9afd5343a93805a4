import { integer, timestamp } from 'drizzle-orm/pg-core';

/** Creation and change times every table carries. */
export const timestamps = {
  createdAt: timestamp('created_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
};

/** The optimistic-locking counter a PATCH must echo back; a stale one answers 409. */
export const version = {
  version: integer('version').notNull().default(1),
};
