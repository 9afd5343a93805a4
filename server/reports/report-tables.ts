import { sql } from 'drizzle-orm';
import { rowsOf, type Database, type Transaction } from '../db/client';

/** A database or an open transaction. */
export type Queryable = Database | Transaction;

/** Whether every one of these tables exists in the public schema. */
export async function tablesExist(db: Queryable, ...tables: string[]): Promise<boolean> {
  const rows = rowsOf<{ present: boolean }>(
    await db.execute(
      sql`select bool_and(to_regclass('public.' || name) is not null) as present
          from unnest(${`{${tables.join(',')}}`}::text[]) as name`,
    ),
  );
  return rows[0]?.present === true;
}

/** The answer of a section whose tables are not in this database yet. */
export function notAvailable(what: string): { available: false; reason: string } {
  return { available: false, reason: `${what} are not available in this database yet.` };
}
