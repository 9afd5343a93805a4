import { and, count, eq, inArray, sql, type SQL } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { instruments, schools } from '../db/schema/index';
import { instruments as engineInstruments } from '@shared/music/index';
import type { ListResponse } from '@shared/api/list';
import { instrumentFiltersSchema, type Instrument } from '@shared/api/instrument';
import { schoolScope, type Actor } from '../core/policy';
import { listPage, matchesText, orderFor, parseListQuery } from '../core/list-query';
import { notFound } from '../core/errors';
import {
  cleaningCautionFor,
  familyOf,
  handlingNoteFor,
  instrumentNameOf,
} from './instrument-cautions';

/** The columns an instrument answer is built from. */
export const instrumentColumns = {
  id: instruments.id,
  assetTag: instruments.assetTag,
  instrumentId: instruments.instrumentId,
  maker: instruments.maker,
  model: instruments.model,
  serial: instruments.serial,
  purchasedOn: instruments.purchasedOn,
  purchaseCostCents: instruments.purchaseCostCents,
  fundingSource: instruments.fundingSource,
  condition: instruments.condition,
  status: instruments.status,
  homeSchoolId: instruments.homeSchoolId,
  homeSchoolCode: schools.code,
  location: instruments.location,
  notes: instruments.notes,
  version: instruments.version,
  updatedAt: instruments.updatedAt,
};

/** The instruments with their home schools, selecting {@link instrumentColumns}. */
function selectInstruments(db: Database | Transaction) {
  return db
    .select(instrumentColumns)
    .from(instruments)
    .innerJoin(schools, eq(schools.id, instruments.homeSchoolId));
}

type InstrumentRow = Omit<typeof instruments.$inferSelect, 'createdAt'> & {
  homeSchoolCode: string;
};

/** An instrument row as the API answers it, with its cautions. */
export function toInstrument(row: InstrumentRow): Instrument {
  return {
    id: row.id,
    assetTag: row.assetTag,
    instrumentId: row.instrumentId,
    instrumentName: instrumentNameOf(row.instrumentId),
    family: familyOf(row.instrumentId),
    maker: row.maker,
    model: row.model,
    serial: row.serial,
    purchasedOn: row.purchasedOn,
    purchaseCostCents: row.purchaseCostCents,
    fundingSource: row.fundingSource,
    condition: row.condition,
    status: row.status,
    homeSchoolId: row.homeSchoolId,
    homeSchoolCode: row.homeSchoolCode,
    location: row.location,
    notes: row.notes,
    version: row.version,
    updatedAt: row.updatedAt.toISOString(),
    handlingNote: handlingNoteFor(row.instrumentId),
    cleaningCaution: cleaningCautionFor(row.instrumentId),
  };
}

/** The SQL condition limiting instruments to the actor's schools. */
export function instrumentScope(actor: Actor): SQL | undefined {
  const scope = schoolScope(actor);
  if (scope === 'all') return undefined;
  return scope.length ? inArray(instruments.homeSchoolId, scope) : sql`false`;
}

const sortable = {
  assetTag: instruments.assetTag,
  instrumentId: instruments.instrumentId,
  maker: instruments.maker,
  model: instruments.model,
  condition: instruments.condition,
  status: instruments.status,
  purchasedOn: instruments.purchasedOn,
  purchaseCostCents: instruments.purchaseCostCents,
  homeSchoolCode: schools.code,
  updatedAt: instruments.updatedAt,
};

/** The fleet the actor may see, filtered, sorted and paged. */
export async function listInstruments(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<Instrument>> {
  const list = parseListQuery(query, instrumentFiltersSchema);
  const conditions = [instrumentScope(actor)];
  conditions.push(
    matchesText(list.q, [
      instruments.assetTag,
      instruments.serial,
      instruments.maker,
      instruments.model,
    ]),
  );
  if (list.status) conditions.push(eq(instruments.status, list.status));
  if (list.condition) conditions.push(eq(instruments.condition, list.condition));
  if (list.instrumentId) conditions.push(eq(instruments.instrumentId, list.instrumentId));
  if (list.homeSchoolId) conditions.push(eq(instruments.homeSchoolId, list.homeSchoolId));
  if (list.family) {
    const kinds = engineInstruments
      .filter((kind) => kind.family === list.family)
      .map((kind) => kind.id);
    conditions.push(kinds.length ? inArray(instruments.instrumentId, kinds) : sql`false`);
  }
  const where = and(...conditions);
  return listPage(
    list,
    orderFor(list.sort, sortable, 'assetTag:asc', instruments.id),
    selectInstruments(db).where(where).$dynamic(),
    db
      .select({ total: count() })
      .from(instruments)
      .innerJoin(schools, eq(schools.id, instruments.homeSchoolId))
      .where(where),
    toInstrument,
  );
}

/** One instrument the actor may see; 404 otherwise. */
export async function findInstrument(
  db: Database | Transaction,
  actor: Actor,
  id: number,
): Promise<Instrument> {
  const [row] = await selectInstruments(db).where(
    and(eq(instruments.id, id), instrumentScope(actor)),
  );
  if (!row) throw notFound('That instrument');
  return toInstrument(row);
}
