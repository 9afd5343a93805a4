import { idParameter } from '@shared/api/input-rules';
import { and, asc, count, eq, inArray, ne, sql, type SQL } from 'drizzle-orm';
import { z } from 'zod';
import { oneByOne, type Database, type Transaction } from '../db/client';
import { apiTokens, schools, students, userSchools, users } from '../db/schema/index';
import type { ListResponse } from '@shared/api/list';
import { roles, type Role } from '@shared/api/roles';
import {
  assignmentProblems,
  needsSchools,
  type Person,
  type PersonDetail,
  type personInputSchema,
  type personPatchSchema,
} from '@shared/api/person';
import type { Actor } from '../core/policy';
import { listPage, matchesText, orderFor, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { badRequest, notFound, type FieldError } from '../core/errors';
import { updateVersioned } from '../core/versioned-update';

type UserRow = typeof users.$inferSelect;

const personFilters = z.object({
  role: z.enum(roles, { message: `Role is one of: ${roles.join(', ')}.` }).optional(),
  schoolId: idParameter.optional(),
  active: z
    .enum(['true', 'false'], { message: 'Active is true or false.' })
    .transform((value) => value === 'true')
    .optional(),
});

// Never signed in sorts as the oldest sign-in, not above the most recent one.
const lastSignIn = sql`coalesce(${users.lastSignInAt}, '-infinity'::timestamptz)`;
const sortable = {
  name: users.name,
  email: users.email,
  role: users.role,
  lastSignInAt: lastSignIn,
};

/** Adds each user's schools and linked student, in two queries for the whole page. */
async function peopleOf(db: Database | Transaction, rows: UserRow[]): Promise<Person[]> {
  if (rows.length === 0) return [];
  const ids = rows.map((row) => row.id);
  const studentIds = rows.flatMap((row) => (row.studentId === null ? [] : [row.studentId]));
  // One after the other: `db` may be a transaction (see oneByOne).
  const [assignments, linked] = await oneByOne(
    () =>
      db
        .select({
          userId: userSchools.userId,
          id: schools.id,
          code: schools.code,
          name: schools.name,
        })
        .from(userSchools)
        .innerJoin(schools, eq(schools.id, userSchools.schoolId))
        .where(inArray(userSchools.userId, ids))
        .orderBy(asc(schools.name)),
    () =>
      studentIds.length
        ? db.select().from(students).where(inArray(students.id, studentIds))
        : Promise.resolve([]),
  );
  return rows.map((row) => {
    const student = linked.find((candidate) => candidate.id === row.studentId);
    return {
      id: row.id,
      email: row.email,
      name: row.name,
      role: row.role,
      active: row.active,
      schools: assignments
        .filter((assignment) => assignment.userId === row.id)
        .map(({ id, code, name }) => ({ id, code, name })),
      student: student
        ? {
            id: student.id,
            studentNumber: student.studentNumber,
            name: `${student.preferredName ?? student.firstName} ${student.lastName}`,
            schoolId: student.schoolId,
          }
        : null,
      lastSignInAt: row.lastSignInAt?.toISOString() ?? null,
      version: row.version,
      createdAt: row.createdAt.toISOString(),
    };
  });
}

/** Everyone who signs in, searched on name and e-mail, filtered, sorted and paged. */
export async function listPeople(db: Database, query: unknown): Promise<ListResponse<Person>> {
  const list = parseListQuery(query, personFilters);
  const conditions: (SQL | undefined)[] = [];
  conditions.push(matchesText(list.q, [users.name, users.email]));
  if (list.role) conditions.push(eq(users.role, list.role));
  if (list.active !== undefined) conditions.push(eq(users.active, list.active));
  if (list.schoolId !== undefined) {
    conditions.push(
      sql`exists (select 1 from user_schools us where us.user_id = "users"."id" and us.school_id = ${list.schoolId})`,
    );
  }
  const where = and(...conditions);
  const page = await listPage(
    list,
    orderFor(list.sort, sortable, 'name:asc', users.id),
    db.select().from(users).where(where).$dynamic(),
    db.select({ total: count() }).from(users).where(where),
    (row) => row,
  );
  return { rows: await peopleOf(db, page.rows), total: page.total };
}

/** One person with their schools, linked student and API tokens summed up. */
export async function getPerson(db: Database | Transaction, id: number): Promise<PersonDetail> {
  const [row] = await db.select().from(users).where(eq(users.id, id));
  if (!row) throw notFound('That person');
  const [[person], [tokens]] = await oneByOne(
    () => peopleOf(db, [row]),
    () =>
      db
        .select({
          live: sql<number>`(count(*) filter (where ${apiTokens.revokedAt} is null and ${apiTokens.expiresAt} > now()))::int`,
          revoked: sql<number>`(count(*) filter (where ${apiTokens.revokedAt} is not null))::int`,
          lastUsedAt: sql<Date | string | null>`max(${apiTokens.lastUsedAt})`,
        })
        .from(apiTokens)
        .where(eq(apiTokens.userId, id)),
  );
  const lastUsedAt = tokens?.lastUsedAt ? new Date(tokens.lastUsedAt).toISOString() : null;
  return {
    ...person!,
    tokens: { live: tokens?.live ?? 0, revoked: tokens?.revoked ?? 0, lastUsedAt },
  };
}

/** What the audit log keeps of a person, before and after a change. */
async function snapshotOf(db: Database | Transaction, id: number) {
  const detail = await getPerson(db, id);
  return {
    email: detail.email,
    name: detail.name,
    role: detail.role,
    active: detail.active,
    schools: detail.schools.map((school) => school.code),
    schoolIds: detail.schools.map((school) => school.id),
    studentId: detail.student?.id ?? null,
  };
}

function refuse(fieldErrors: FieldError[]): never {
  throw badRequest(
    fieldErrors.length === 1
      ? fieldErrors[0]!.message
      : `The person has ${fieldErrors.length} problems: ${fieldErrors[0]!.message}`,
    fieldErrors,
  );
}

/**
 * Checks the role's rules, that the schools exist and that the student is on the roster and
 * not already someone's account; answers the schools to assign (a student's own school).
 */
async function assignmentsFor(
  db: Database,
  person: { id?: number; role: Role; schoolIds: number[]; studentId: number | null },
): Promise<number[]> {
  const problems: FieldError[] = assignmentProblems(person);
  if (problems.length) refuse(problems);
  if (person.schoolIds.length) {
    const found = await db
      .select({ id: schools.id })
      .from(schools)
      .where(inArray(schools.id, person.schoolIds));
    const missing = person.schoolIds.filter((id) => !found.some((school) => school.id === id));
    if (missing.length)
      refuse([
        { field: 'schoolIds', message: `There is no school with id ${missing.join(', ')}.` },
      ]);
  }
  if (person.studentId === null) return person.schoolIds;
  const [student] = await db
    .select({ id: students.id, schoolId: students.schoolId })
    .from(students)
    .where(eq(students.id, person.studentId));
  if (!student)
    refuse([
      {
        field: 'studentId',
        message: `There is no student with id ${person.studentId} on the roster.`,
      },
    ]);
  const [holder] = await db
    .select({ email: users.email })
    .from(users)
    .where(
      and(
        eq(users.studentId, student.id),
        person.id === undefined ? undefined : ne(users.id, person.id),
      ),
    );
  if (holder)
    refuse([{ field: 'studentId', message: `That student already signs in as ${holder.email}.` }]);
  return [student.schoolId];
}

async function assignSchools(tx: Transaction, userId: number, schoolIds: number[]) {
  await tx.delete(userSchools).where(eq(userSchools.userId, userId));
  if (schoolIds.length)
    await tx.insert(userSchools).values(schoolIds.map((schoolId) => ({ userId, schoolId })));
}

/** Adds someone who may sign in, with their role, schools and (a student) roster row. */
export async function createPerson(
  db: Database,
  actor: Actor,
  input: z.output<typeof personInputSchema>,
): Promise<PersonDetail> {
  const studentId = input.studentId ?? null;
  const [clash] = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email));
  if (clash) refuse([{ field: 'email', message: `${input.email} already signs in here.` }]);
  const schoolIds = await assignmentsFor(db, {
    role: input.role,
    schoolIds: input.schoolIds,
    studentId,
  });
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(users)
      .values({ email: input.email, name: input.name, role: input.role, studentId })
      .returning({ id: users.id });
    await assignSchools(tx, row!.id, schoolIds);
    const after = await snapshotOf(tx, row!.id);
    await recordAudit(tx, actor, { action: 'create', entity: 'user', entityId: row!.id, after });
    return getPerson(tx, row!.id);
  });
}

/**
 * Refuses a coordinator's stepping down or deactivating themselves. Only an active coordinator
 * reaches these routes, so when the change is made by someone else another coordinator is
 * left: refusing the self-change is what keeps the district from losing its last one.
 */
function refuseSelfDemotion(actor: Actor, before: UserRow, role: Role, active: boolean) {
  if (before.id !== actor.userId || before.role !== 'coordinator') return;
  if (!active) {
    refuse([
      {
        field: 'active',
        message:
          'You cannot deactivate your own account: ask another coordinator to do it, so the district always keeps one.',
      },
    ]);
  }
  if (role !== 'coordinator') {
    refuse([
      {
        field: 'role',
        message:
          'You cannot change your own role from coordinator: ask another coordinator to do it, so the district always keeps one.',
      },
    ]);
  }
}

/**
 * Changes a person's name, role, active flag or schools (the list replaces the old one),
 * refusing a stale version and anything that would leave the district without a coordinator.
 */
export async function updatePerson(
  db: Database,
  actor: Actor,
  id: number,
  patch: z.output<typeof personPatchSchema>,
): Promise<PersonDetail> {
  const [before] = await db.select().from(users).where(eq(users.id, id));
  if (!before) throw notFound('That person');
  const role = patch.role ?? before.role;
  const active = patch.active ?? before.active;
  refuseSelfDemotion(actor, before, role, active);
  const current = await db
    .select({ schoolId: userSchools.schoolId })
    .from(userSchools)
    .where(eq(userSchools.userId, id));
  const keptSchools =
    needsSchools(role) && needsSchools(before.role) ? current.map((row) => row.schoolId) : [];
  const requested = {
    id,
    role,
    schoolIds: patch.schoolIds ?? keptSchools,
    studentId:
      patch.studentId !== undefined
        ? patch.studentId
        : role === 'student'
          ? before.studentId
          : null,
  };
  const schoolIds = await assignmentsFor(db, requested);
  return db.transaction(async (tx) => {
    const beforeSnapshot = await snapshotOf(tx, id);
    const changes = {
      role,
      active,
      studentId: requested.studentId,
      ...(patch.name ? { name: patch.name } : {}),
    };
    await updateVersioned(tx, users, id, patch.version, changes, 'That person');
    await assignSchools(tx, id, schoolIds);
    const after = await snapshotOf(tx, id);
    await recordAudit(tx, actor, {
      action: 'update',
      entity: 'user',
      entityId: id,
      before: beforeSnapshot,
      after,
    });
    return getPerson(tx, id);
  });
}
