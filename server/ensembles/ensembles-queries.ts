import { and, asc, count, desc, eq, inArray, sql, type AnyColumn, type SQL } from 'drizzle-orm';
import { ensembleFiltersSchema, type Ensemble } from '@shared/api/ensemble';
import type { ListResponse } from '@shared/api/list';
import type { Database } from '../db/client';
import { ensembles, schools, users } from '../db/schema/index';
import { badRequest } from '../core/errors';
import { listPage, matchesText, parseListQuery } from '../core/list-query';
import { schoolScope, type Actor } from '../core/policy';
import {
  ensembleColumns,
  memberCount,
  memberCountIn,
  toEnsemble,
  type EnsembleRecord,
} from './ensemble-row';

const sortOrders: Record<string, (AnyColumn | SQL)[]> = {
  name: [ensembles.name, schools.code, ensembles.id],
  school: [schools.code, ensembles.name, ensembles.id],
  kind: [ensembles.kind, ensembles.name, ensembles.id],
  memberCount: [memberCount, ensembles.name, ensembles.id],
};

function orderBy(sort: string | undefined, members: SQL): SQL[] {
  const [field, direction] = (sort ?? 'name:asc').split(':') as [string, 'asc' | 'desc'];
  const columns =
    field === 'memberCount' ? [members, ensembles.name, ensembles.id] : sortOrders[field];
  if (!columns) {
    throw badRequest(
      `Cannot sort by '${field}'. Sort by one of: ${Object.keys(sortOrders).join(', ')}.`,
      [{ field: 'sort', message: `Unknown field '${field}'.` }],
    );
  }
  return columns.map((column) => (direction === 'desc' ? desc(column) : asc(column)));
}

/** The scope condition on ensembles: their school is one of the actor's. */
export function ensembleScope(actor: Actor): SQL | undefined {
  const scope = schoolScope(actor);
  if (scope === 'all') return undefined;
  return scope.length ? inArray(ensembles.schoolId, scope) : sql`false`;
}

/** The ensembles the actor may see, searched by name, filtered, sorted and paged. */
export async function listEnsembles(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<Ensemble>> {
  const list = parseListQuery(query, ensembleFiltersSchema);
  // Seats belong to a year: a past year's list counts that year's members.
  const members = list.schoolYearId === undefined ? memberCount : memberCountIn(list.schoolYearId);
  const where = and(
    ensembleScope(actor),
    matchesText(list.q, [ensembles.name]),
    list.schoolId !== undefined ? eq(ensembles.schoolId, list.schoolId) : undefined,
    list.kind ? eq(ensembles.kind, list.kind) : undefined,
  );
  return listPage(
    list,
    orderBy(list.sort, members),
    db
      .select({ ...ensembleColumns, memberCount: members })
      .from(ensembles)
      .innerJoin(schools, eq(schools.id, ensembles.schoolId))
      .leftJoin(users, eq(users.id, ensembles.directorUserId))
      .where(where)
      .$dynamic(),
    db.select({ total: count() }).from(ensembles).where(where),
    (row) => toEnsemble(row as EnsembleRecord),
  );
}
