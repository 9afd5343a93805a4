import { count, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { districts, schoolYears, schools, userSchools, users } from '../db/schema/index';
import { demoDistrict, demoSchools, demoUsers } from './demo-people';
import { findDistrictRow, forgetDistrictIdentity } from '../district/district-queries';
import { seedDemoRoster } from './demo-roster';
import { seedDemoFleet } from './demo-fleet';
import { seedDemoFees } from './demo-fees';
import { seedDemoLadder } from './demo-ladder';
import { seedDemoLastYear } from './demo-last-year';
import { refreshStatistics } from '../db/statistics';
import { SeededRandom } from './random';

/** The school year the demo runs in: 2026–27, August to June. */
export const demoSchoolYear = { name: '2026-27', startsOn: '2026-08-17', endsOn: '2027-06-11' };

/** Whether the database holds no district yet: no district record and no schools. */
export async function isEmpty(db: Database): Promise<boolean> {
  if (await findDistrictRow(db)) return false;
  const [row] = await db.select({ value: count() }).from(schools);
  return row!.value === 0;
}

/**
 * A demo seeded before districts had a record of their own: gives it the demo district's
 * record, so it is not taken for a database that was never set up. Answers whether it did.
 */
export async function adoptDemoDistrict(db: Database): Promise<boolean> {
  if (await findDistrictRow(db)) return false;
  const coordinator = demoUsers.find((user) => user.role === 'coordinator')!;
  const [user] = await db
    .select({ id: users.id })
    .from(users)
    .where(eq(users.email, coordinator.email));
  if (!user) return false;
  await db.insert(districts).values(demoDistrict);
  forgetDistrictIdentity(db);
  return true;
}

/**
 * Seeds the invented Merrow Basin Unified district in one transaction. Its pass-offs end the day
 * before `seededOn` (see `lastDemoPassOffDay` in demo-ladder.ts); everything else is the same
 * whatever the day.
 */
export async function seedDemo(db: Database, seededOn = new Date()): Promise<void> {
  const random = new SeededRandom(20261201);
  await db.transaction(async (tx) => {
    await tx.insert(districts).values(demoDistrict);
    const schoolRows = await tx
      .insert(schools)
      .values(
        demoSchools.map(({ code, name, level, address, lowestGrade, highestGrade }) => ({
          code,
          name,
          level,
          address,
          lowestGrade,
          highestGrade,
        })),
      )
      .returning({ id: schools.id, code: schools.code });
    const schoolIds = new Map(schoolRows.map((row) => [row.code, row.id]));
    for (const school of demoSchools) {
      if (!school.sendsTo) continue;
      await tx
        .update(schools)
        .set({ sendsToSchoolId: schoolIds.get(school.sendsTo)! })
        .where(eq(schools.id, schoolIds.get(school.code)!));
    }
    const [year] = await tx
      .insert(schoolYears)
      .values({ ...demoSchoolYear, current: true })
      .returning({ id: schoolYears.id });
    const directorOf = new Map<string, number>();
    let studentUserId = 0;
    for (const account of demoUsers) {
      const [user] = await tx
        .insert(users)
        .values({ email: account.email, name: account.name, role: account.role })
        .returning({ id: users.id });
      if (account.schools.length) {
        await tx
          .insert(userSchools)
          .values(
            account.schools.map((code) => ({ userId: user!.id, schoolId: schoolIds.get(code)! })),
          );
      }
      if (account.role === 'director')
        for (const code of account.schools) directorOf.set(code, user!.id);
      if (account.role === 'student') studentUserId = user!.id;
    }
    await seedDemoRoster(tx, random, {
      schoolIds,
      directorOf,
      schoolYearId: year!.id,
      studentUserId,
    });
    await seedDemoFleet(tx, { schoolYearEndsOn: demoSchoolYear.endsOn });
    await seedDemoFees(tx);
    await seedDemoLadder(tx, {
      directorOf,
      schoolYearEndsOn: demoSchoolYear.endsOn,
      seededOn,
    });
    await seedDemoLastYear(tx, { schoolIds, directorOf });
  });
}

/** Seeds the demo district when the database is empty; answers whether it did. */
export async function seedDemoWhenEmpty(db: Database): Promise<boolean> {
  if (!(await isEmpty(db))) {
    await adoptDemoDistrict(db);
    return false;
  }
  await seedDemo(db);
  forgetDistrictIdentity(db);
  await findDistrictRow(db);
  await refreshStatistics(db);
  return true;
}
