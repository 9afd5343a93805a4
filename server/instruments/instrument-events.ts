import type { Database, Transaction } from '../db/client';
import { instrumentEvents } from '../db/schema/index';
import type { InstrumentEventKind } from '@shared/api/instrument';

/** One timeline entry to write. */
export interface InstrumentEventInput {
  instrumentId: number;
  kind: InstrumentEventKind;
  note?: string;
  userId?: number | null;
  loanId?: number | null;
  repairId?: number | null;
  countId?: number | null;
  at?: Date;
}

/** Writes timeline entries in the caller's transaction. */
export async function recordInstrumentEvents(
  db: Database | Transaction,
  ...events: InstrumentEventInput[]
): Promise<void> {
  if (events.length === 0) return;
  await db.insert(instrumentEvents).values(
    events.map((event) => ({
      instrumentId: event.instrumentId,
      kind: event.kind,
      note: event.note ?? '',
      userId: event.userId ?? null,
      loanId: event.loanId ?? null,
      repairId: event.repairId ?? null,
      countId: event.countId ?? null,
      ...(event.at ? { at: event.at } : {}),
    })),
  );
}
