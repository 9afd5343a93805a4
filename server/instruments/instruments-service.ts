import { eq, sql } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { instruments } from '../db/schema/index';
import type {
  Instrument,
  InstrumentCondition,
  InstrumentInput,
  InstrumentPatch,
  InstrumentStatus,
} from '@shared/api/instrument';
import type { Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { badRequest, HttpError } from '../core/errors';
import { createThenRead, insertAudited, updateAudited } from '../core/versioned-update';
import { findInstrument } from './instruments-queries';
import { assertSchoolInScope } from '../schools/school-exists';
import { recordInstrumentEvents } from './instrument-events';

/** 409 with a message that says why, rather than the stale-version text. */
export const stateConflict = (message: string) => new HttpError(409, 'conflict', message);

/** Sets an instrument's status (and condition) as a loan, repair or count moves it; bumps its version. */
export async function setInstrumentStatus(
  tx: Transaction,
  id: number,
  status: InstrumentStatus,
  condition?: InstrumentCondition,
): Promise<void> {
  await tx
    .update(instruments)
    .set({
      status,
      ...(condition ? { condition } : {}),
      version: sql`${instruments.version} + 1`,
      updatedAt: new Date(),
    })
    .where(eq(instruments.id, id));
}

async function assertAssetTagFree(db: Database | Transaction, assetTag: string, exceptId?: number) {
  const [clash] = await db
    .select({ id: instruments.id })
    .from(instruments)
    .where(eq(instruments.assetTag, assetTag));
  if (clash && clash.id !== exceptId) {
    throw badRequest(`The asset tag ${assetTag} is already on another instrument.`, [
      { field: 'assetTag', message: `${assetTag} is already used in the district.` },
    ]);
  }
}

/** Adds an instrument to the fleet, with a purchase entry on its timeline. */
export async function createInstrument(
  db: Database,
  actor: Actor,
  input: InstrumentInput,
): Promise<Instrument> {
  await assertSchoolInScope(db, actor, input.homeSchoolId);
  await assertAssetTagFree(db, input.assetTag);
  return createThenRead(
    db,
    async (tx) => {
      const row = await insertAudited(tx, actor, instruments, input, 'instrument');
      await recordInstrumentEvents(tx, {
        instrumentId: row.id,
        kind: 'purchase',
        note: input.purchasedOn ? `Bought ${input.purchasedOn}` : 'Added to the fleet',
        userId: actor.userId,
      });
      return row;
    },
    (id) => findInstrument(db, actor, id),
  );
}

/**
 * Changes an instrument, refusing a stale version. A hand-set status may not take an instrument
 * off a loan or out of repair: those follow their loan and tickets.
 */
export async function updateInstrument(
  db: Database,
  actor: Actor,
  id: number,
  patch: InstrumentPatch,
): Promise<Instrument> {
  const current = await findInstrument(db, actor, id);
  const { version, ...changes } = patch;
  if (changes.homeSchoolId !== undefined)
    await assertSchoolInScope(db, actor, changes.homeSchoolId);
  if (changes.assetTag) await assertAssetTagFree(db, changes.assetTag, id);
  if (changes.status && changes.status !== current.status) {
    if (current.status === 'on-loan' || current.status === 'in-repair') {
      throw stateConflict(
        `${current.assetTag} is ${current.status === 'on-loan' ? 'out on loan' : 'in repair'}; return the loan or close its repair tickets instead of setting its status by hand.`,
      );
    }
  }
  await db.transaction(async (tx) => {
    const target = { table: instruments, id, entity: 'instrument', what: 'That instrument' };
    const { before } = await updateAudited(tx, actor, target, version, changes);
    if (changes.condition && changes.condition !== before!.condition) {
      await recordInstrumentEvents(tx, {
        instrumentId: id,
        kind: 'condition-change',
        note: `Condition ${before!.condition} → ${changes.condition}`,
        userId: actor.userId,
      });
    }
    if (changes.status === 'missing' && before!.status !== 'missing') {
      await recordInstrumentEvents(tx, {
        instrumentId: id,
        kind: 'marked-missing',
        note: 'Marked missing by hand',
        userId: actor.userId,
      });
    }
  });
  return findInstrument(db, actor, id);
}

/** Records that a returned instrument was cleaned and sanitised; it may then be lent again. */
export async function markCleaned(
  db: Database,
  actor: Actor,
  id: number,
  note: string,
): Promise<Instrument> {
  const current = await findInstrument(db, actor, id);
  if (current.status !== 'to-clean' && current.status !== 'available') {
    throw stateConflict(
      `${current.assetTag} is ${current.status}; only an instrument back from a loan (waiting to be cleaned) can be marked cleaned.`,
    );
  }
  await db.transaction(async (tx) => {
    await setInstrumentStatus(tx, id, 'available');
    await recordInstrumentEvents(tx, {
      instrumentId: id,
      kind: 'cleaned',
      note: note || 'Cleaned and sanitised',
      userId: actor.userId,
    });
    await recordAudit(tx, actor, {
      action: 'cleaned',
      entity: 'instrument',
      entityId: id,
      before: { status: current.status },
      after: { status: 'available' },
    });
  });
  return findInstrument(db, actor, id);
}
