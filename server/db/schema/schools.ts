import {
  boolean,
  index,
  integer,
  pgTable,
  text,
  uniqueIndex,
  type AnyPgColumn,
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { identity, timestamps, version, day } from './columns';

/** A school of the district, known everywhere by its short code (HPMS, TRHS…). */
export const schools = pgTable(
  'schools',
  {
    ...identity,
    code: text('code').notNull(),
    name: text('name').notNull(),
    level: text('level').notNull(),
    address: text('address').notNull().default(''),
    /** The lowest and highest grade taught here; kindergarten is 0. */
    lowestGrade: integer('lowest_grade'),
    highestGrade: integer('highest_grade'),
    /** The school its students move up to after its highest grade. */
    sendsToSchoolId: integer('sends_to_school_id').references((): AnyPgColumn => schools.id),
    /** The day the school closed; a closed school keeps its history. */
    closedOn: day('closed_on'),
    ...version,
    ...timestamps,
  },
  (table) => [
    uniqueIndex('schools_code_unique').on(table.code),
    index('schools_name_idx').on(table.name),
  ],
);

/** A school year such as 2026–27, with the dates loans fall due and benchmarks are read against. */
export const schoolYears = pgTable(
  'school_years',
  {
    ...identity,
    name: text('name').notNull(),
    startsOn: day('starts_on').notNull(),
    endsOn: day('ends_on').notNull(),
    current: boolean('current').notNull().default(false),
    ...version,
    ...timestamps,
  },
  (table) => [
    uniqueIndex('school_years_name_unique').on(table.name),
    // Exactly one year is current: at most one by this index, at least one by the service.
    uniqueIndex('school_years_one_current')
      .on(table.current)
      .where(sql`current`),
  ],
);
