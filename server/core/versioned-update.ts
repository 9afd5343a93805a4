import { and, eq, sql, type InferInsertModel, type InferSelectModel } from 'drizzle-orm';
import type { PgTable, PgColumn } from 'drizzle-orm/pg-core';
import type { Database, Transaction } from '../db/client';
import { recordAudit } from './audit';
import { conflict, notFound } from './errors';
import type { Actor } from './policy';

type VersionedTable = PgTable & { id: PgColumn; version: PgColumn; updatedAt: PgColumn };

/**
 * Updates one row only if it still has the version the editor started from, bumping it.
 * A missing row answers 404 and a changed one 409, so two editors never silently overwrite
 * each other.
 */
export async function updateVersioned<Table extends VersionedTable>(
  db: Database | Transaction,
  table: Table,
  id: number,
  expectedVersion: number,
  changes: Partial<InferSelectModel<Table>>,
  what: string,
): Promise<InferSelectModel<Table>> {
  const updated = (await db
    .update(table)
    .set({ ...changes, version: sql`${table.version} + 1`, updatedAt: new Date() } as never)
    .where(and(eq(table.id, id), eq(table.version, expectedVersion)))
    .returning()) as InferSelectModel<Table>[];
  if (updated[0]) return updated[0];
  const existing = await db
    .select({ id: table.id })
    .from(table as PgTable)
    .where(eq(table.id, id));
  if (existing.length === 0) throw notFound(what);
  throw conflict();
}

/**
 * Inserts one row and records its creation in the audit log, in the caller's transaction:
 * the one way a service adds a row with history. The log keeps the row as stored, or what
 * `audited` makes of it (a row with a bulky or derived column leaves it out). Answers the row.
 */
export async function insertAudited<Table extends PgTable & { id: PgColumn }>(
  db: Database | Transaction,
  actor: Actor | null,
  table: Table,
  values: InferInsertModel<Table>,
  entity: string,
  audited: (row: InferSelectModel<Table>) => unknown = (row) => row,
): Promise<InferSelectModel<Table>> {
  const [row] = (await db
    .insert(table)
    .values(values as never)
    .returning()) as (InferSelectModel<Table> & { id: number })[];
  await recordAudit(db, actor, {
    action: 'create',
    entity,
    entityId: row!.id,
    after: audited(row!),
  });
  return row!;
}

/**
 * Adds a record in one transaction and answers it as the actor reads it once committed: `write`
 * inserts it (through `insertAudited`, with the checks and side rows that go with it) and
 * answers the new row; `read` loads it by id outside the transaction.
 */
export async function createThenRead<Answer>(
  db: Database,
  write: (tx: Transaction) => Promise<{ id: number }>,
  read: (id: number) => Promise<Answer>,
): Promise<Answer> {
  const { id } = await db.transaction(write);
  return read(id);
}

/**
 * `updateVersioned` with history: reads the row as it was, updates it from the version the
 * editor started from, and records the change with the row before and after in the audit log,
 * in the caller's transaction. Answers both rows.
 */
export async function updateAudited<Table extends VersionedTable>(
  tx: Database | Transaction,
  actor: Actor,
  target: { table: Table; id: number; entity: string; what: string },
  expectedVersion: number,
  changes: Partial<InferSelectModel<Table>>,
): Promise<{ before: InferSelectModel<Table>; after: InferSelectModel<Table> }> {
  const { table, id, entity, what } = target;
  const [before] = (await tx
    .select()
    .from(table as PgTable)
    .where(eq(table.id, id))) as InferSelectModel<Table>[];
  const after = await updateVersioned(tx, table, id, expectedVersion, changes, what);
  await recordAudit(tx, actor, { action: 'update', entity, entityId: id, before, after });
  return { before: before!, after };
}
