import { count } from 'drizzle-orm';
import type { Database } from '../db/client';
import { schoolYears, schools, userSchools, users } from '../db/schema/index';
import { demoSchools, demoUsers } from './demo-people';
import { seedDemoRoster } from './demo-roster';
import { seedDemoFleet } from './demo-fleet';
import { seedDemoFees } from './demo-fees';
import { seedDemoLadder } from './demo-ladder';
import { refreshStatistics } from '../db/statistics';
import { SeededRandom } from './random';

/** The school year the demo runs in: 2026–27, August to June. */
export const demoSchoolYear = { name: '2026-27', startsOn: '2026-08-17', endsOn: '2027-06-11' };

/** Whether the database holds no district yet. */
export async function isEmpty(db: Database): Promise<boolean> {
  const [row] = await db.select({ value: count() }).from(schools);
  return row!.value === 0;
}

/**
 * Seeds the invented Merrow Basin Unified district in one transaction. Its pass-offs end the day
 * before `seededOn` (see `lastDemoPassOffDay` in demo-ladder.ts); everything else is the same
 * whatever the day.
 */
export async function seedDemo(db: Database, seededOn = new Date()): Promise<void> {
  const random = new SeededRandom(20261201);
  await db.transaction(async (tx) => {
    const schoolRows = await tx
      .insert(schools)
      .values(demoSchools.map(({ code, name, level, address }) => ({ code, name, level, address })))
      .returning({ id: schools.id, code: schools.code });
    const schoolIds = new Map(schoolRows.map((row) => [row.code, row.id]));
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
  });
}

/** Seeds the demo district when the database is empty; answers whether it did. */
export async function seedDemoWhenEmpty(db: Database): Promise<boolean> {
  if (!(await isEmpty(db))) return false;
  await seedDemo(db);
  await refreshStatistics(db);
  return true;
}
