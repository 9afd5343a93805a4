import { and, count, eq, inArray, sql, type SQL } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { instruments, repairTickets, schools, users } from '../db/schema/index';
import type { ListResponse } from '@shared/api/list';
import {
  repairFiltersSchema,
  type Repair,
  type RepairInput,
  type RepairPatch,
} from '@shared/api/repair';
import { schoolScope, type Actor } from '../core/policy';
import { listPage, matchesText, orderFor, parseListQuery } from '../core/list-query';
import { recordAudit } from '../core/audit';
import { notFound } from '../core/errors';
import { createThenRead, insertAudited, updateVersioned } from '../core/versioned-update';
import { findInstrument } from '../instruments/instruments-queries';
import { recordInstrumentEvents } from '../instruments/instrument-events';
import { setInstrumentStatus, stateConflict } from '../instruments/instruments-service';
import { instrumentNameOf } from '../instruments/instrument-cautions';
import { todayIso } from '../loans/school-calendar';

/** Ticket statuses during which the instrument is away being repaired. */
export const openRepairStatuses = ['open', 'sent'] as const;

const columns = {
  ticket: repairTickets,
  assetTag: instruments.assetTag,
  instrumentType: instruments.instrumentId,
  homeSchoolId: instruments.homeSchoolId,
  homeSchoolCode: schools.code,
  reportedByName: users.name,
};

function toRepair(row: {
  ticket: typeof repairTickets.$inferSelect;
  assetTag: string;
  instrumentType: string;
  homeSchoolId: number;
  homeSchoolCode: string;
  reportedByName: string | null;
}): Repair {
  const { ticket } = row;
  return {
    id: ticket.id,
    instrumentId: ticket.instrumentId,
    assetTag: row.assetTag,
    instrumentName: instrumentNameOf(row.instrumentType),
    homeSchoolId: row.homeSchoolId,
    homeSchoolCode: row.homeSchoolCode,
    problem: ticket.problem,
    reportedBy: ticket.reportedBy,
    reportedByName: row.reportedByName,
    vendor: ticket.vendor,
    inHouse: ticket.inHouse,
    estimateCents: ticket.estimateCents,
    finalCostCents: ticket.finalCostCents,
    sentOn: ticket.sentOn,
    returnedOn: ticket.returnedOn,
    status: ticket.status,
    notes: ticket.notes,
    createdAt: ticket.createdAt.toISOString(),
    version: ticket.version,
  };
}

function scope(actor: Actor): SQL | undefined {
  const schoolIds = schoolScope(actor);
  if (schoolIds === 'all') return undefined;
  return schoolIds.length ? inArray(instruments.homeSchoolId, schoolIds) : sql`false`;
}

function selectRepairs(db: Database | Transaction) {
  return db
    .select(columns)
    .from(repairTickets)
    .innerJoin(instruments, eq(instruments.id, repairTickets.instrumentId))
    .innerJoin(schools, eq(schools.id, instruments.homeSchoolId))
    .leftJoin(users, eq(users.id, repairTickets.reportedBy));
}

const sortable = {
  createdAt: repairTickets.createdAt,
  status: repairTickets.status,
  assetTag: instruments.assetTag,
  sentOn: repairTickets.sentOn,
  returnedOn: repairTickets.returnedOn,
  estimateCents: repairTickets.estimateCents,
  finalCostCents: repairTickets.finalCostCents,
};

/** The repair tickets of the instruments the actor may see. */
export async function listRepairs(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<Repair>> {
  const list = parseListQuery(query, repairFiltersSchema);
  const conditions = [scope(actor)];
  conditions.push(
    matchesText(list.q, [instruments.assetTag, repairTickets.problem, repairTickets.vendor]),
  );
  if (list.status) conditions.push(eq(repairTickets.status, list.status));
  if (list.open === 'true') conditions.push(inArray(repairTickets.status, [...openRepairStatuses]));
  if (list.open === 'false') conditions.push(inArray(repairTickets.status, ['returned', 'closed']));
  if (list.instrumentId) conditions.push(eq(repairTickets.instrumentId, list.instrumentId));
  if (list.homeSchoolId) conditions.push(eq(instruments.homeSchoolId, list.homeSchoolId));
  const where = and(...conditions);
  return listPage(
    list,
    orderFor(list.sort, sortable, 'createdAt:desc', repairTickets.id),
    selectRepairs(db).where(where).$dynamic(),
    db
      .select({ total: count() })
      .from(repairTickets)
      .innerJoin(instruments, eq(instruments.id, repairTickets.instrumentId))
      .where(where),
    toRepair,
  );
}

/** One repair ticket the actor may see. */
export async function findRepair(
  db: Database | Transaction,
  actor: Actor,
  id: number,
): Promise<Repair> {
  const [row] = await selectRepairs(db).where(and(eq(repairTickets.id, id), scope(actor)));
  if (!row) throw notFound('That repair ticket');
  return toRepair(row);
}

/**
 * Puts the instrument's status in line with its tickets: in repair while any is open or sent;
 * back to available when the last one is returned or closed. Loans, losses and retirement win.
 */
export async function followTickets(tx: Transaction, instrumentId: number): Promise<void> {
  const [{ open }] = (await tx
    .select({ open: count() })
    .from(repairTickets)
    .where(
      and(
        eq(repairTickets.instrumentId, instrumentId),
        inArray(repairTickets.status, [...openRepairStatuses]),
      ),
    )) as [{ open: number }];
  const [instrument] = await tx
    .select({ status: instruments.status })
    .from(instruments)
    .where(eq(instruments.id, instrumentId));
  if (open > 0 && (instrument!.status === 'available' || instrument!.status === 'to-clean')) {
    await setInstrumentStatus(tx, instrumentId, 'in-repair');
  } else if (open === 0 && instrument!.status === 'in-repair') {
    await setInstrumentStatus(tx, instrumentId, 'available');
  }
}

/** Opens a ticket; the instrument goes into repair. One out on loan is returned as damaged instead. */
export async function createRepair(
  db: Database,
  actor: Actor,
  input: RepairInput,
): Promise<Repair> {
  const instrument = await findInstrument(db, actor, input.instrumentId);
  if (instrument.status === 'on-loan') {
    throw stateConflict(
      `${instrument.assetTag} is out on loan: take the return with the damage noted, which opens the ticket.`,
    );
  }
  if (instrument.status === 'missing' || instrument.status === 'retired') {
    throw stateConflict(`${instrument.assetTag} is ${instrument.status}; it cannot go to repair.`);
  }
  return createThenRead(
    db,
    async (tx) => {
      const ticket = await insertAudited(
        tx,
        actor,
        repairTickets,
        { ...input, inHouse: input.vendor === null, reportedBy: actor.userId },
        'repair',
      );
      await followTickets(tx, input.instrumentId);
      await recordInstrumentEvents(tx, {
        instrumentId: input.instrumentId,
        kind: 'repair-open',
        note: input.problem,
        userId: actor.userId,
        repairId: ticket.id,
      });
      return ticket;
    },
    (id) => findRepair(db, actor, id),
  );
}

/** Changes a ticket, refusing a stale version; the instrument's status follows. */
export async function updateRepair(
  db: Database,
  actor: Actor,
  id: number,
  patch: RepairPatch,
): Promise<Repair> {
  const current = await findRepair(db, actor, id);
  const { version, ...changes } = patch;
  if (changes.status === 'sent' && changes.sentOn === undefined && !current.sentOn)
    changes.sentOn = todayIso();
  if (
    (changes.status === 'returned' || changes.status === 'closed') &&
    changes.returnedOn === undefined &&
    !current.returnedOn &&
    current.sentOn
  ) {
    changes.returnedOn = todayIso();
  }
  if (changes.vendor !== undefined && changes.inHouse === undefined)
    changes.inHouse = changes.vendor === null;
  await db.transaction(async (tx) => {
    const [before] = await tx.select().from(repairTickets).where(eq(repairTickets.id, id));
    const after = await updateVersioned(
      tx,
      repairTickets,
      id,
      version,
      changes,
      'That repair ticket',
    );
    const wasOpen = (openRepairStatuses as readonly string[]).includes(before!.status);
    const isOpen = (openRepairStatuses as readonly string[]).includes(after.status);
    if (wasOpen !== isOpen) {
      await recordInstrumentEvents(tx, {
        instrumentId: current.instrumentId,
        kind: isOpen ? 'repair-open' : 'repair-close',
        note: isOpen
          ? `Ticket reopened: ${after.problem}`
          : `Ticket ${after.status}${after.finalCostCents !== null ? `, cost ${after.finalCostCents} cents` : ''}`,
        userId: actor.userId,
        repairId: id,
      });
    }
    await followTickets(tx, current.instrumentId);
    await recordAudit(tx, actor, {
      action: 'update',
      entity: 'repair',
      entityId: id,
      before,
      after,
    });
  });
  return findRepair(db, actor, id);
}
