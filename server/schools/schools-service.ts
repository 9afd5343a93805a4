import { and, count, eq, ilike, inArray, or, sql, type SQL } from 'drizzle-orm';
import { z } from 'zod';
import type { Database } from '../db/client';
import { schools, students } from '../db/schema/index';
import type { ListResponse } from '../../shared/api/list';
import type { School, SchoolInput } from '../../shared/api/school';
import { schoolLevels, schoolPatchSchema } from '../../shared/api/school';
import { assertInScope, schoolScope, type Actor } from '../core/policy';
import { likePattern, orderFor, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { updateVersioned } from '../core/versioned-update';

const schoolFilters = z.object({
  level: z.enum(schoolLevels).optional(),
  code: z.string().optional(),
});

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

function toSchool(
  row: Pick<typeof schools.$inferSelect, keyof typeof schoolColumns> & {
    studentCount?: number;
    ensembleCount?: number;
  },
): School {
  return {
    id: row.id,
    code: row.code,
    name: row.name,
    level: row.level as School['level'],
    address: row.address,
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
  if (list.q) {
    const pattern = likePattern(list.q);
    conditions.push(or(ilike(schools.name, pattern), ilike(schools.code, pattern)));
  }
  if (list.level) conditions.push(eq(schools.level, list.level));
  if (list.code) conditions.push(eq(schools.code, list.code.toUpperCase()));
  const where = and(...conditions);
  const [rows, [total]] = await Promise.all([
    db
      .select({ ...schoolColumns, studentCount, ensembleCount })
      .from(schools)
      .where(where)
      .orderBy(...orderFor(list.sort, sortable, 'name:asc', schools.id))
      .limit(list.limit)
      .offset(list.offset),
    db.select({ total: count() }).from(schools).where(where),
  ]);
  return { rows: rows.map(toSchool), total: total!.total };
}

const schoolColumns = {
  id: schools.id,
  code: schools.code,
  name: schools.name,
  level: schools.level,
  address: schools.address,
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
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(schools).values(input).returning();
    await recordAudit(tx, actor, {
      action: 'create',
      entity: 'school',
      entityId: row!.id,
      after: row,
    });
    return toSchool(row!);
  });
}

/** Changes a school, refusing a stale version. */
export async function updateSchool(
  db: Database,
  actor: Actor,
  id: number,
  patch: z.infer<typeof schoolPatchSchema>,
): Promise<School> {
  const { version, ...changes } = patch;
  if (changes.code) await assertCodeFree(db, changes.code, id);
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(schools).where(eq(schools.id, id));
    const after = await updateVersioned(tx, schools, id, version, changes, 'That school');
    await recordAudit(tx, actor, {
      action: 'update',
      entity: 'school',
      entityId: id,
      before,
      after,
    });
    return toSchool(after);
  });
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
  await db.transaction(async (tx) => {
    const [before] = await tx.delete(schools).where(eq(schools.id, id)).returning();
    await recordAudit(tx, actor, { action: 'delete', entity: 'school', entityId: id, before });
  });
}
