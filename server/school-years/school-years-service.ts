import { and, asc, eq, gte, lte, ne, sql } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { schoolYears } from '../db/schema/index';
import type {
  SchoolYear,
  SchoolYearInput,
  SchoolYearList,
  SchoolYearPatch,
} from '@shared/api/school-year';
import type { Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { insertAudited, updateVersioned } from '../core/versioned-update';

type SchoolYearRow = typeof schoolYears.$inferSelect;

function toSchoolYear(row: SchoolYearRow, current: SchoolYearRow | undefined): SchoolYear {
  return {
    id: row.id,
    name: row.name,
    startsOn: row.startsOn,
    endsOn: row.endsOn,
    current: row.current,
    past: current !== undefined && !row.current && row.endsOn < current.startsOn,
    version: row.version,
  };
}

/** Every school year, oldest first (any signed-in user). */
export async function listSchoolYears(db: Database): Promise<SchoolYearList> {
  const rows = await db.select().from(schoolYears).orderBy(asc(schoolYears.startsOn));
  const current = rows.find((row) => row.current);
  return { rows: rows.map((row) => toSchoolYear(row, current)), total: rows.length };
}

/** Throws 400 when the name is taken or the dates overlap another year. */
export async function assertYearFits(
  db: Database | Transaction,
  year: { name: string; startsOn: string; endsOn: string },
  exceptId?: number,
) {
  const others = exceptId === undefined ? undefined : ne(schoolYears.id, exceptId);
  const [named] = await db
    .select({ id: schoolYears.id })
    .from(schoolYears)
    .where(and(eq(schoolYears.name, year.name), others));
  if (named) {
    throw badRequest(`The school year ${year.name} already exists.`, [
      { field: 'name', message: `${year.name} is already the name of a school year.` },
    ]);
  }
  const [overlapping] = await db
    .select({ name: schoolYears.name, startsOn: schoolYears.startsOn, endsOn: schoolYears.endsOn })
    .from(schoolYears)
    .where(
      and(lte(schoolYears.startsOn, year.endsOn), gte(schoolYears.endsOn, year.startsOn), others),
    );
  if (overlapping) {
    throw badRequest(
      `${year.startsOn} to ${year.endsOn} overlaps ${overlapping.name} (${overlapping.startsOn} to ${overlapping.endsOn}).`,
      [{ field: 'startsOn', message: `The dates overlap ${overlapping.name}.` }],
    );
  }
}

/**
 * Adds a school year (coordinator). It is not current unless it is the district's first: a
 * later year becomes current by starting it, which promotes the roster.
 */
export async function createSchoolYear(
  db: Database,
  actor: Actor,
  input: SchoolYearInput,
): Promise<SchoolYear> {
  return db.transaction(async (tx) => {
    await assertYearFits(tx, input);
    const [anyYear] = await tx.select({ id: schoolYears.id }).from(schoolYears).limit(1);
    const row = await insertAudited(
      tx,
      actor,
      schoolYears,
      { ...input, current: anyYear === undefined },
      'school-year',
    );
    const [current] = await tx.select().from(schoolYears).where(eq(schoolYears.current, true));
    return toSchoolYear(row, current);
  });
}

/**
 * Renames or re-dates a school year, or makes it the current one (coordinator). Making a year
 * current by hand moves no student: it is a correction; a new year is started instead.
 */
export async function updateSchoolYear(
  db: Database,
  actor: Actor,
  id: number,
  patch: SchoolYearPatch,
): Promise<SchoolYear> {
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(schoolYears).where(eq(schoolYears.id, id));
    if (!before) throw notFound('That school year');
    const next = {
      name: patch.name ?? before.name,
      startsOn: patch.startsOn ?? before.startsOn,
      endsOn: patch.endsOn ?? before.endsOn,
    };
    if (next.startsOn >= next.endsOn) {
      throw badRequest('The first day comes before the last day.', [
        { field: 'endsOn', message: 'The first day comes before the last day.' },
      ]);
    }
    await assertYearFits(tx, next, id);
    if (patch.current && !before.current) {
      await tx
        .update(schoolYears)
        .set({ current: false, updatedAt: new Date() })
        .where(eq(schoolYears.current, true));
    }
    const row = await updateVersioned(
      tx,
      schoolYears,
      id,
      patch.version,
      { ...next, ...(patch.current ? { current: true } : {}) },
      'That school year',
    );
    await recordAudit(tx, actor, {
      action: 'update',
      entity: 'school-year',
      entityId: id,
      before,
      after: row,
    });
    const [current] = await tx.select().from(schoolYears).where(eq(schoolYears.current, true));
    return toSchoolYear(row, current);
  });
}

/** The current school year, or undefined before the district has one. */
export async function currentSchoolYearRow(
  db: Database | Transaction,
): Promise<SchoolYearRow | undefined> {
  const [row] = await db
    .select()
    .from(schoolYears)
    .where(sql`${schoolYears.current}`);
  return row;
}
