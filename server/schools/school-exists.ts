import { eq } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { schools } from '../db/schema/index';
import { badRequest } from '../core/errors';

/** Refuses with 400, naming `field`, a school id that is none of the district's schools. */
export async function assertDistrictSchool(
  db: Database | Transaction,
  schoolId: number,
  field: string,
): Promise<void> {
  const [school] = await db
    .select({ id: schools.id })
    .from(schools)
    .where(eq(schools.id, schoolId));
  if (!school) {
    throw badRequest('There is no such school.', [
      { field, message: 'Choose one of the district’s schools.' },
    ]);
  }
}
