import { asc, eq, gte } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { schoolYears } from '../db/schema/index';
import { districtToday } from '../district/district-clock';

/**
 * A day as YYYY-MM-DD, the form loan dates are kept in: today in the district's time zone (its
 * settings), or the UTC day of a given moment (date arithmetic on days already in that form).
 */
export function todayIso(now?: Date): string {
  return now ? now.toISOString().slice(0, 10) : districtToday();
}

/**
 * The day a loan falls due when none is given: the last day of the current school year, else of
 * the next year that has not ended, else a year from today.
 */
export async function defaultDueDate(
  db: Database | Transaction,
  today = todayIso(),
): Promise<string> {
  const [current] = await db.select().from(schoolYears).where(eq(schoolYears.current, true));
  if (current && current.endsOn >= today) return current.endsOn;
  const [next] = await db
    .select()
    .from(schoolYears)
    .where(gte(schoolYears.endsOn, today))
    .orderBy(asc(schoolYears.endsOn))
    .limit(1);
  if (next) return next.endsOn;
  const inAYear = new Date(`${today}T00:00:00Z`);
  inAYear.setUTCFullYear(inAYear.getUTCFullYear() + 1);
  return todayIso(inAYear);
}
