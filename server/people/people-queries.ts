import { and, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { schools, userSchools, users } from '../db/schema/index';
import type { Actor } from '../core/policy';

/** Loads an active user as an actor, with their school assignments; undefined when unknown. */
export async function loadActor(
  db: Database,
  userId: number,
  via: Actor['via'],
): Promise<Actor | undefined> {
  const [user] = await db
    .select()
    .from(users)
    .where(and(eq(users.id, userId), eq(users.active, true)));
  if (!user) return undefined;
  const assignments = await db
    .select({ schoolId: userSchools.schoolId })
    .from(userSchools)
    .where(eq(userSchools.userId, user.id));
  return {
    userId: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    schoolIds: assignments.map((assignment) => assignment.schoolId),
    studentId: user.studentId,
    via,
  };
}

/** Finds an active user by e-mail (case-insensitive). */
export async function findUserByEmail(db: Database, email: string) {
  const [user] = await db.select().from(users).where(eq(users.email, email.trim().toLowerCase()));
  return user;
}

/** The schools an actor is assigned to, or every school for district-wide roles. */
export async function schoolsOf(db: Database, actor: Actor) {
  const all = await db
    .select({ id: schools.id, code: schools.code, name: schools.name })
    .from(schools)
    .orderBy(schools.name);
  if (actor.role === 'coordinator' || actor.role === 'technician') return all;
  return all.filter((school) => actor.schoolIds.includes(school.id));
}
