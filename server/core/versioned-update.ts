import { and, eq, sql, type InferSelectModel } from 'drizzle-orm';
import type { PgTable, PgColumn } from 'drizzle-orm/pg-core';
import type { Database, Transaction } from '../db/client';
import { conflict, notFound } from './errors';

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
  const existing = await db.select({ id: table.id }).from(table as PgTable).where(eq(table.id, id));
  if (existing.length === 0) throw notFound(what);
  throw conflict();
}
