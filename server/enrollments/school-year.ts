import { desc, eq, sql, type SQL } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { schoolYears } from '../db/schema/index';
import { badRequest, HttpError } from '../core/errors';

/**
 * The school year marked current, or undefined before one is set up. Should two be marked, the
 * later-starting one is current, as the roster import and the reports take it.
 */
export async function findCurrentSchoolYear(
  db: Database | Transaction,
): Promise<{ id: number; name: string } | undefined> {
  const [year] = await db
    .select({ id: schoolYears.id, name: schoolYears.name })
    .from(schoolYears)
    .where(eq(schoolYears.current, true))
    .orderBy(desc(schoolYears.startsOn))
    .limit(1);
  return year;
}

/**
 * The current school year's id as a scalar subquery (NULL before one is set up, which no seat
 * matches), for a statement that needs it only as a condition: one statement fewer than reading
 * the year first, on a path as hot as a grid page.
 */
export const currentSchoolYearId: SQL<number | null> =
  sql`(select ${schoolYears.id} from ${schoolYears} where ${schoolYears.current} order by ${schoolYears.startsOn} desc limit 1)`;

/** The current school year; a 400 when the district has none marked current. */
export async function currentSchoolYear(
  db: Database | Transaction,
): Promise<{ id: number; name: string }> {
  const year = await findCurrentSchoolYear(db);
  if (!year) {
    throw badRequest('No school year is marked current; the coordinator sets one up first.');
  }
  return year;
}

/**
 * Throws 409 when a seat belongs to a year other than the current one: a past year is
 * history, read but not changed.
 */
export async function assertYearOpen(
  db: Database | Transaction,
  seat: { schoolYearId: number; schoolYearName: string },
): Promise<void> {
  const current = await findCurrentSchoolYear(db);
  if (current?.id === seat.schoolYearId) return;
  throw new HttpError(
    409,
    'year_closed',
    `That seat belongs to ${seat.schoolYearName}, which is history and can no longer be changed.`,
  );
}
