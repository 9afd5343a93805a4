import { and, count, eq, inArray, isNotNull, isNull, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { z } from 'zod';
import type { Database } from '../db/client';
import { schools, students } from '../db/schema/index';
import type { ListResponse } from '@shared/api/list';
import type { School, SchoolInput, SchoolPatch } from '@shared/api/school';
import { schoolLevels } from '@shared/api/school';
import { assertInScope, schoolScope, type Actor } from '../core/policy';
import { listPage, matchesText, orderFor, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { createThenRead, insertAudited, updateAudited } from '../core/versioned-update';

const schoolFilters = z.object({
  level: z.enum(schoolLevels).optional(),
  code: z.string().optional(),
  /** open: schools not closed; closed: the closed ones; all (the default): both. */
  status: z.enum(['open', 'closed', 'all']).optional(),
});

const sendsTo = alias(schools, 'sends_to');

// Written out with table names: Drizzle leaves columns unqualified in a one-table select.
// Active students from the per-school counts the student triggers keep (migration 0009).
const studentCount = sql<number>`(select coalesce(sum(c.students), 0)::int from student_counts c where c.school_id = "schools"."id" and c.status = 'active')`;
const ensembleCount = sql<number>`(select count(*)::int from ensembles e where e.school_id = "schools"."id")`;

const sortable = {
  code: schools.code,
  name: schools.name,
  level: schools.level,
  studentCount,
  ensembleCount,
};

type SchoolRow = typeof schools.$inferSelect & {
  studentCount?: number;
  ensembleCount?: number;
  sendsToCode?: string | null;
  sendsToName?: string | null;
};

function toSchool(row: SchoolRow): School {
  return {
    id: row.id,
    code: row.code,
    name: row.name,
    level: row.level as School['level'],
    address: row.address,
    lowestGrade: row.lowestGrade,
    highestGrade: row.highestGrade,
    sendsToSchoolId: row.sendsToSchoolId,
    sendsTo:
      row.sendsToSchoolId !== null && row.sendsToCode && row.sendsToName
        ? { id: row.sendsToSchoolId, code: row.sendsToCode, name: row.sendsToName }
        : null,
    closedOn: row.closedOn,
    version: row.version,
    studentCount: row.studentCount,
    ensembleCount: row.ensembleCount,
  };
}

function scopeCondition(actor: Actor): SQL | undefined {
  const scope = schoolScope(actor);
  if (scope === 'all') return undefined;
  return scope.length ? inArray(schools.id, scope) : sql`false`;
}

/** The schools the actor may see, filtered, sorted and paged. */
export async function listSchools(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<School>> {
  const list = parseListQuery(query, schoolFilters);
  const conditions = [scopeCondition(actor)];
  conditions.push(matchesText(list.q, [schools.name, schools.code]));
  if (list.level) conditions.push(eq(schools.level, list.level));
  if (list.code) conditions.push(eq(schools.code, list.code.toUpperCase()));
  if (list.status === 'open') conditions.push(isNull(schools.closedOn));
  if (list.status === 'closed') conditions.push(isNotNull(schools.closedOn));
  const where = and(...conditions);
  return listPage(
    list,
    orderFor(list.sort, sortable, 'name:asc', schools.id),
    db
      .select({ ...schoolColumns, studentCount, ensembleCount })
      .from(schools)
      .leftJoin(sendsTo, eq(sendsTo.id, schools.sendsToSchoolId))
      .where(where)
      .$dynamic(),
    db.select({ total: count() }).from(schools).where(where),
    toSchool,
  );
}

const schoolColumns = {
  id: schools.id,
  code: schools.code,
  name: schools.name,
  level: schools.level,
  address: schools.address,
  lowestGrade: schools.lowestGrade,
  highestGrade: schools.highestGrade,
  sendsToSchoolId: schools.sendsToSchoolId,
  sendsToCode: sendsTo.code,
  sendsToName: sendsTo.name,
  closedOn: schools.closedOn,
  version: schools.version,
  createdAt: schools.createdAt,
  updatedAt: schools.updatedAt,
};

/** One school, when the actor may see it. */
export async function getSchool(db: Database, actor: Actor, id: number): Promise<School> {
  assertInScope(actor, id, 'That school');
  const [row] = await db
    .select({ ...schoolColumns, studentCount, ensembleCount })
    .from(schools)
    .leftJoin(sendsTo, eq(sendsTo.id, schools.sendsToSchoolId))
    .where(eq(schools.id, id));
  if (!row) throw notFound('That school');
  return toSchool(row);
}

async function assertCodeFree(db: Database, code: string, exceptId?: number) {
  const [clash] = await db.select({ id: schools.id }).from(schools).where(eq(schools.code, code));
  if (clash && clash.id !== exceptId) {
    throw badRequest(`The school code ${code} is already used.`, [
      { field: 'code', message: `${code} is already the code of another school.` },
    ]);
  }
}

/** Adds a school (coordinator only; the route checks the capability). */
export async function createSchool(
  db: Database,
  actor: Actor,
  input: SchoolInput,
): Promise<School> {
  await assertCodeFree(db, input.code);
  await assertSendsTo(db, input.sendsToSchoolId);
  return createThenRead(
    db,
    (tx) => insertAudited(tx, actor, schools, input, 'school'),
    (id) => getSchool(db, actor, id),
  );
}

/** Changes a school, refusing a stale version. */
export async function updateSchool(
  db: Database,
  actor: Actor,
  id: number,
  patch: SchoolPatch,
): Promise<School> {
  const { version, ...changes } = patch;
  if (changes.code) await assertCodeFree(db, changes.code, id);
  await assertSendsTo(db, changes.sendsToSchoolId, id);
  await db.transaction(async (tx) => {
    const target = { table: schools, id, entity: 'school', what: 'That school' };
    const { after } = await updateAudited(tx, actor, target, version, changes);
    if (
      after.lowestGrade !== null &&
      after.highestGrade !== null &&
      after.lowestGrade > after.highestGrade
    ) {
      throw badRequest('The lowest grade served is above the highest.', [
        { field: 'highestGrade', message: 'The lowest grade served is above the highest.' },
      ]);
    }
  });
  return getSchool(db, actor, id);
}

/** The school students move up to must exist, be open, and not be the school itself. */
async function assertSendsTo(
  db: Database,
  sendsToSchoolId: number | null | undefined,
  selfId?: number,
) {
  if (sendsToSchoolId === null || sendsToSchoolId === undefined) return;
  const refuse = (message: string) => {
    throw badRequest(message, [{ field: 'sendsToSchoolId', message }]);
  };
  if (sendsToSchoolId === selfId) refuse('A school cannot send its students on to itself.');
  const [target] = await db
    .select({ id: schools.id, closedOn: schools.closedOn })
    .from(schools)
    .where(eq(schools.id, sendsToSchoolId));
  if (!target) refuse('The school students move up to does not exist.');
  if (target!.closedOn) refuse('The school students move up to is closed.');
}

/** Removes a school that has no students or ensembles. */
export async function deleteSchool(db: Database, actor: Actor, id: number): Promise<void> {
  const school = await getSchool(db, actor, id);
  const [{ value: studentsThere }] = (await db
    .select({ value: count() })
    .from(students)
    .where(eq(students.schoolId, id))) as [{ value: number }];
  if (studentsThere > 0 || (school.ensembleCount ?? 0) > 0) {
    throw badRequest(
      `${school.name} still has ${studentsThere} students and ${school.ensembleCount} ensembles; move or remove them first.`,
    );
  }
  const [feeder] = await db
    .select({ name: schools.name })
    .from(schools)
    .where(eq(schools.sendsToSchoolId, id))
    .limit(1);
  if (feeder) {
    throw badRequest(
      `${feeder.name} sends its students on to ${school.name}; change that first, or close ${school.name} instead.`,
    );
  }
  await db.transaction(async (tx) => {
    const [before] = await tx.delete(schools).where(eq(schools.id, id)).returning();
    await recordAudit(tx, actor, { action: 'delete', entity: 'school', entityId: id, before });
  });
}
