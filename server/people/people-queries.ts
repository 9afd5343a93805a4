import { idParameter, plainText } from '@shared/api/input-rules';
import { and, count, eq, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { z } from 'zod';
import { rowsOf, type Database } from '../db/client';
import { auditLog, schools, users } from '../db/schema/index';
import type { Actor } from '../core/policy';
import { listPage, matchesText, orderFor, parseListQuery } from '../core/list-query';
import type { ListResponse } from '@shared/api/list';
import type { AuditEntryRow } from '@shared/api/person';

/** An actor's row as the one-statement lookups with `actorColumns` answer it. */
export interface ActorRow {
  id: number;
  email: string;
  name: string;
  role: Actor['role'];
  student_id: number | null;
  school_ids: number[];
}

/**
 * The columns of an actor, from `users u`, with their school assignments gathered in the same
 * statement (every request authenticates, so this is one round trip, not two).
 */
export const actorColumns = sql`u.id, u.email, u.name, u.role, u.student_id,
  array(select us.school_id from user_schools us where us.user_id = u.id order by us.school_id) as school_ids`;

/** An actor from a row selected with `actorColumns`. */
export function actorFromRow(row: ActorRow, via: Actor['via']): Actor {
  return {
    userId: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    schoolIds: row.school_ids.map(Number),
    studentId: row.student_id,
    via,
  };
}

/** Loads an active user as an actor, with their school assignments; undefined when unknown. */
export async function loadActor(
  db: Database,
  userId: number,
  via: Actor['via'],
): Promise<Actor | undefined> {
  const [row] = rowsOf<ActorRow>(
    await db.execute(sql`select ${actorColumns} from users u where u.id = ${userId} and u.active`),
  );
  return row ? actorFromRow(row, via) : undefined;
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

// The person an entry is about, so a sign-in (which has no acting user yet) names who it was.
const subject = alias(users, 'subject');
const aboutSubject = and(
  eq(auditLog.entity, 'user'),
  eq(auditLog.entityId, sql`cast(${subject.id} as text)`),
);

const auditFilters = z.object({
  entity: plainText().max(60).optional(),
  entityId: plainText().max(60).optional(),
  userId: idParameter.optional(),
});

/** The audit log, newest first unless sorted otherwise, filtered by entity, row and who. */
export async function listAudit(
  db: Database,
  query: unknown,
): Promise<ListResponse<AuditEntryRow>> {
  const list = parseListQuery(query, auditFilters);
  const conditions: (SQL | undefined)[] = [];
  if (list.entity) conditions.push(eq(auditLog.entity, list.entity));
  if (list.entityId) conditions.push(eq(auditLog.entityId, list.entityId));
  if (list.userId !== undefined) conditions.push(eq(auditLog.userId, list.userId));
  conditions.push(
    matchesText(list.q, [auditLog.action, auditLog.entity, users.name, users.email, subject.name]),
  );
  const where = and(...conditions);
  return listPage(
    list,
    orderFor(list.sort, { at: auditLog.at }, 'at:desc', auditLog.id),
    db
      .select({
        entry: auditLog,
        userName: users.name,
        userEmail: users.email,
        entityName: subject.name,
      })
      .from(auditLog)
      .leftJoin(users, eq(users.id, auditLog.userId))
      .leftJoin(subject, aboutSubject)
      .where(where)
      .$dynamic(),
    db
      .select({ total: count() })
      .from(auditLog)
      .leftJoin(users, eq(users.id, auditLog.userId))
      .leftJoin(subject, aboutSubject)
      .where(where),
    ({ entry, userName, userEmail, entityName }) => ({
      id: entry.id,
      at: entry.at.toISOString(),
      userId: entry.userId,
      userName,
      userEmail,
      action: entry.action,
      entity: entry.entity,
      entityId: entry.entityId,
      entityName,
      before: entry.before,
      after: entry.after,
    }),
  );
}
