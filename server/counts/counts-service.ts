import { and, count, desc, eq, inArray, sql, type SQL } from 'drizzle-orm';
import type { Database } from '../db/client';
import { countScans, counts, instruments, repairTickets, schools, users } from '../db/schema/index';
import type { ListResponse } from '@shared/api/list';
import {
  countFiltersSchema,
  type Count,
  type CountDetail,
  type CountScan,
  type ScanOutcome,
} from '@shared/api/count';
import { schoolScope, type Actor } from '../core/policy';
import { listPage, orderFor, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { createThenRead, insertAudited } from '../core/versioned-update';
import { notFound } from '../core/errors';
import { recordInstrumentEvents } from '../instruments/instrument-events';
import { setInstrumentStatus, stateConflict } from '../instruments/instruments-service';
import { instrumentNameOf } from '../instruments/instrument-cautions';
import { assertSchoolInScope } from '../schools/school-exists';

const scanCount = sql<number>`(select count(*)::int from count_scans cs where cs.count_id = "counts"."id")`;

const countColumns = {
  id: counts.id,
  schoolId: counts.schoolId,
  schoolCode: schools.code,
  startedBy: counts.startedBy,
  startedByName: users.name,
  startedAt: counts.startedAt,
  closedAt: counts.closedAt,
  state: counts.state,
  scanCount,
};

function toCount(row: {
  id: number;
  schoolId: number;
  schoolCode: string;
  startedBy: number | null;
  startedByName: string | null;
  startedAt: Date;
  closedAt: Date | null;
  state: 'open' | 'closed';
  scanCount: number;
}): Count {
  return {
    ...row,
    startedAt: row.startedAt.toISOString(),
    closedAt: row.closedAt?.toISOString() ?? null,
  };
}

function scope(actor: Actor): SQL | undefined {
  const schoolIds = schoolScope(actor);
  if (schoolIds === 'all') return undefined;
  return schoolIds.length ? inArray(counts.schoolId, schoolIds) : sql`false`;
}

function selectCounts(db: Database) {
  return db
    .select(countColumns)
    .from(counts)
    .innerJoin(schools, eq(schools.id, counts.schoolId))
    .leftJoin(users, eq(users.id, counts.startedBy));
}

/** The counts of the actor's schools, newest first. */
export async function listCounts(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<Count>> {
  const list = parseListQuery(query, countFiltersSchema);
  const where = and(
    scope(actor),
    list.schoolId ? eq(counts.schoolId, list.schoolId) : undefined,
    list.state ? eq(counts.state, list.state) : undefined,
  );
  return listPage(
    list,
    orderFor(
      list.sort,
      { startedAt: counts.startedAt, schoolCode: schools.code, state: counts.state },
      'startedAt:desc',
      counts.id,
    ),
    selectCounts(db).where(where).$dynamic(),
    db.select({ total: count() }).from(counts).where(where),
    toCount,
  );
}

async function findCount(db: Database, actor: Actor, id: number): Promise<Count> {
  const [row] = await selectCounts(db).where(and(eq(counts.id, id), scope(actor)));
  if (!row) throw notFound('That count');
  return toCount(row);
}

/** Starts a count at a school; one open count per school at a time. */
export async function startCount(
  db: Database,
  actor: Actor,
  schoolId: number,
): Promise<CountDetail> {
  await assertSchoolInScope(db, actor, schoolId);
  const [open] = await db
    .select({ id: counts.id })
    .from(counts)
    .where(and(eq(counts.schoolId, schoolId), eq(counts.state, 'open')));
  if (open)
    throw stateConflict(
      `A count is already open at this school (count ${open.id}); finish it first.`,
    );
  return createThenRead(
    db,
    (tx) => insertAudited(tx, actor, counts, { schoolId, startedBy: actor.userId }, 'count'),
    (id) => countDetail(db, actor, id),
  );
}

/** Records one scanned or typed asset tag and what it matched. */
export async function recordScan(
  db: Database,
  actor: Actor,
  id: number,
  typedTag: string,
): Promise<CountScan> {
  const current = await findCount(db, actor, id);
  if (current.state !== 'open')
    throw stateConflict('This count is closed; start a new one to scan again.');
  const tag = typedTag.trim().toUpperCase();
  const [instrument] = await db
    .select({ id: instruments.id, homeSchoolId: instruments.homeSchoolId })
    .from(instruments)
    .where(eq(instruments.assetTag, tag));
  const [already] = await db
    .select({ id: countScans.id })
    .from(countScans)
    .where(
      and(
        eq(countScans.countId, id),
        instrument
          ? eq(countScans.instrumentId, instrument.id)
          : sql`upper(${countScans.assetTag}) = ${tag}`,
      ),
    );
  const outcome: ScanOutcome = already
    ? 'duplicate'
    : !instrument
      ? 'unknown'
      : instrument.homeSchoolId === current.schoolId
        ? 'found'
        : 'found-elsewhere';
  const scan = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(countScans)
      .values({
        countId: id,
        assetTag: typedTag.trim(),
        instrumentId: instrument?.id ?? null,
        outcome,
        scannedBy: actor.userId,
      })
      .returning();
    if (instrument && !already) {
      await recordInstrumentEvents(tx, {
        instrumentId: instrument.id,
        kind: 'count-found',
        note: `Scanned in the count at ${current.schoolCode}`,
        userId: actor.userId,
        countId: id,
      });
    }
    return row!;
  });
  return scanView(scan);
}

/** A scan as the API returns it. */
function scanView(scan: typeof countScans.$inferSelect) {
  return {
    id: scan.id,
    assetTag: scan.assetTag,
    instrumentId: scan.instrumentId,
    outcome: scan.outcome,
    scannedAt: scan.scannedAt.toISOString(),
  };
}

/** A count with its scans and the reconciliation against the fleet's records. */
export async function countDetail(db: Database, actor: Actor, id: number): Promise<CountDetail> {
  const current = await findCount(db, actor, id);
  const scans = await db
    .select()
    .from(countScans)
    .where(eq(countScans.countId, id))
    .orderBy(desc(countScans.scannedAt), desc(countScans.id));
  const scannedIds = new Set(
    scans.flatMap((scan) => (scan.instrumentId === null ? [] : [scan.instrumentId])),
  );
  const relevant = await countedInstruments(db, current.schoolId, id);
  const toCounted = (row: (typeof relevant)[number]) => ({
    id: row.id,
    assetTag: row.assetTag,
    instrumentName: instrumentNameOf(row.instrumentType),
    status: row.status,
    homeSchoolId: row.homeSchoolId,
    homeSchoolCode: row.homeSchoolCode,
  });
  const home = relevant.filter((row) => row.homeSchoolId === current.schoolId);
  const sent = await repairsAtVendor(db, scannedIds);
  const sentByInstrument = new Map(sent.map((ticket) => [ticket.instrumentId, ticket]));
  return {
    ...current,
    scans: scans.map(scanView),
    reconciliation: {
      found: home.filter((row) => scannedIds.has(row.id)).map(toCounted),
      foundElsewhere: relevant
        .filter((row) => row.homeSchoolId !== current.schoolId && scannedIds.has(row.id))
        .map(toCounted),
      notFound: home
        .filter(
          (row) =>
            !scannedIds.has(row.id) &&
            (row.status === 'available' || row.status === 'to-clean' || row.status === 'in-repair'),
        )
        .map(toCounted),
      unknownTags: [
        ...new Set(scans.filter((scan) => scan.outcome === 'unknown').map((scan) => scan.assetTag)),
      ],
      onLoan: home
        .filter((row) => !scannedIds.has(row.id) && row.status === 'on-loan')
        .map(toCounted),
      atVendor: relevant.flatMap((row) => {
        const ticket = sentByInstrument.get(row.id);
        return ticket
          ? [
              {
                ...toCounted(row),
                repairId: ticket.id,
                vendor: ticket.vendor,
                sentOn: ticket.sentOn,
              },
            ]
          : [];
      }),
    },
  };
}

/** The instruments a count is reconciled against: the school's own and any scanned in it. */
function countedInstruments(db: Database, schoolId: number, countId: number) {
  return db
    .select({
      id: instruments.id,
      assetTag: instruments.assetTag,
      instrumentType: instruments.instrumentId,
      status: instruments.status,
      homeSchoolId: instruments.homeSchoolId,
      homeSchoolCode: schools.code,
    })
    .from(instruments)
    .innerJoin(schools, eq(schools.id, instruments.homeSchoolId))
    .where(
      sql`${instruments.homeSchoolId} = ${schoolId} or ${instruments.id} in (select cs.instrument_id from count_scans cs where cs.count_id = ${countId})`,
    )
    .orderBy(instruments.assetTag);
}

/** The repairs out at a vendor for the scanned instruments. */
async function repairsAtVendor(db: Database, scannedIds: Set<number>) {
  if (!scannedIds.size) return [];
  return db
    .select({
      id: repairTickets.id,
      instrumentId: repairTickets.instrumentId,
      vendor: repairTickets.vendor,
      sentOn: repairTickets.sentOn,
    })
    .from(repairTickets)
    .where(
      and(eq(repairTickets.status, 'sent'), inArray(repairTickets.instrumentId, [...scannedIds])),
    );
}

/**
 * Closes a count. With `confirmMissing`, every instrument expected and not found is marked
 * missing; instruments marked missing earlier that were scanned are available again.
 */
export async function closeCount(
  db: Database,
  actor: Actor,
  id: number,
  confirmMissing: boolean,
): Promise<CountDetail> {
  const detail = await countDetail(db, actor, id);
  if (detail.state !== 'open') throw stateConflict('This count is already closed.');
  await db.transaction(async (tx) => {
    const closed = await tx
      .update(counts)
      .set({ state: 'closed', closedAt: new Date(), updatedAt: new Date() })
      .where(and(eq(counts.id, id), eq(counts.state, 'open')))
      .returning({ id: counts.id });
    if (closed.length === 0)
      throw stateConflict('This count was closed a moment ago by someone else.');
    if (confirmMissing) {
      for (const instrument of detail.reconciliation.notFound) {
        await setInstrumentStatus(tx, instrument.id, 'missing');
        await recordInstrumentEvents(tx, {
          instrumentId: instrument.id,
          kind: 'marked-missing',
          note: `Not found in the count at ${detail.schoolCode}`,
          userId: actor.userId,
          countId: id,
        });
      }
    }
    for (const instrument of [
      ...detail.reconciliation.found,
      ...detail.reconciliation.foundElsewhere,
    ]) {
      if (instrument.status === 'missing')
        await setInstrumentStatus(tx, instrument.id, 'available');
    }
    await recordAudit(tx, actor, {
      action: 'close',
      entity: 'count',
      entityId: id,
      after: {
        confirmMissing,
        missing: confirmMissing ? detail.reconciliation.notFound.map((row) => row.assetTag) : [],
      },
    });
  });
  return countDetail(db, actor, id);
}
