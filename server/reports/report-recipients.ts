import { and, asc, eq, inArray } from 'drizzle-orm';
import { schools, userSchools, users } from '../db/schema/index';
import type { Queryable } from './report-tables';

/** A director a report goes to. */
export interface Director {
  userId: number;
  email: string;
  name: string;
  schoolId: number;
}

/** The active directors assigned to the schools (every school when `'all'`). */
export async function directorsOf(db: Queryable, schoolIds: number[] | 'all'): Promise<Director[]> {
  if (schoolIds !== 'all' && schoolIds.length === 0) return [];
  return db
    .select({
      userId: users.id,
      email: users.email,
      name: users.name,
      schoolId: userSchools.schoolId,
    })
    .from(userSchools)
    .innerJoin(users, eq(users.id, userSchools.userId))
    .innerJoin(schools, eq(schools.id, userSchools.schoolId))
    .where(
      and(
        eq(users.role, 'director'),
        eq(users.active, true),
        schoolIds === 'all' ? undefined : inArray(userSchools.schoolId, schoolIds),
      ),
    )
    .orderBy(asc(schools.code), asc(users.email));
}
