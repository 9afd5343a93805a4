import { eq } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { schools } from '../db/schema/index';
import { badRequest, notFound } from '../core/errors';
import { assertInScope, type Actor } from '../core/policy';

async function schoolExists(db: Database | Transaction, schoolId: number): Promise<boolean> {
  const [school] = await db
    .select({ id: schools.id })
    .from(schools)
    .where(eq(schools.id, schoolId));
  return school !== undefined;
}

/** Refuses with 400, naming `field`, a school id that is none of the district's schools. */
export async function assertDistrictSchool(
  db: Database | Transaction,
  schoolId: number,
  field: string,
): Promise<void> {
  if (!(await schoolExists(db, schoolId))) {
    throw badRequest('There is no such school.', [
      { field, message: 'Choose one of the district’s schools.' },
    ]);
  }
}

/** Refuses, as 404 "That school", a school outside the actor's schools or not in the district. */
export async function assertSchoolInScope(
  db: Database | Transaction,
  actor: Actor,
  schoolId: number,
): Promise<void> {
  assertInScope(actor, schoolId, 'That school');
  if (!(await schoolExists(db, schoolId))) throw notFound('That school');
}
