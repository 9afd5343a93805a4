import type { DatabaseHandle } from '../db/client';

/** A value of a staged row. */
export type StagedValue = string | number | null;

/** One connection inside one transaction, with plain SQL and a bulk load. */
export interface SqlSession {
  query<Row = Record<string, unknown>>(text: string, params?: unknown[]): Promise<Row[]>;
  /** Loads rows into a table: `COPY … FROM '/dev/blob'` in PGlite, multi-row INSERTs on a server. */
  load(table: string, columns: readonly string[], rows: readonly StagedValue[][]): Promise<void>;
}

// RFC 4180 fields for COPY … WITH (FORMAT csv): an unquoted empty field is NULL, a quoted one ''.
function csvValue(value: StagedValue): string {
  if (value === null) return '';
  if (typeof value === 'number') return String(value);
  return `"${value.replaceAll('"', '""')}"`;
}

/**
 * The one `json` text column a statement answers, parsed: large results are aggregated with
 * json_agg, because PGlite decodes result rows one by one in JavaScript.
 */
export async function queryJson<Item>(
  session: SqlSession,
  text: string,
  params?: unknown[],
): Promise<Item[]> {
  const [row] = await session.query<{ json: string | null }>(text, params);
  return row?.json ? (JSON.parse(row.json) as Item[]) : [];
}

/** The rows as the CSV text PostgreSQL's COPY reads. */
export function copyText(rows: readonly StagedValue[][]): string {
  const lines: string[] = new Array(rows.length);
  for (let index = 0; index < rows.length; index++)
    lines[index] = rows[index]!.map(csvValue).join(',');
  return lines.length ? `${lines.join('\n')}\n` : '';
}

// PostgreSQL allows 65,535 parameters in one statement; 1,000 rows of a dozen columns stay below.
const insertBatch = 1000;

async function insertInBatches(
  query: SqlSession['query'],
  table: string,
  columns: readonly string[],
  rows: readonly StagedValue[][],
) {
  for (let start = 0; start < rows.length; start += insertBatch) {
    const batch = rows.slice(start, start + insertBatch);
    const params: StagedValue[] = [];
    const tuples = batch.map((row) => {
      const places = row.map((value) => {
        params.push(value);
        return `$${params.length}`;
      });
      return `(${places.join(',')})`;
    });
    await query(`insert into ${table} (${columns.join(',')}) values ${tuples.join(',')}`, params);
  }
}

/**
 * Runs work in one transaction on one connection: PGlite's own transaction (so COPY can read
 * its blob), or a pooled PostgreSQL client between BEGIN and COMMIT. A throw rolls it all back.
 */
export async function inSqlTransaction<Result>(
  database: DatabaseHandle,
  work: (session: SqlSession) => Promise<Result>,
): Promise<Result> {
  if (database.pglite) {
    return database.pglite.transaction(async (transaction) => {
      const query: SqlSession['query'] = async <Row>(text: string, params: unknown[] = []) =>
        (await transaction.query<Row>(text, params)).rows;
      return work({
        query,
        async load(table, columns, rows) {
          if (rows.length === 0) return;
          await transaction.query(
            `copy ${table} (${columns.join(',')}) from '/dev/blob' with (format csv)`,
            [],
            { blob: new Blob([copyText(rows)]) },
          );
        },
      });
    });
  }
  if (!database.pool) throw new Error('The database has neither PGlite nor a PostgreSQL pool.');
  const client = await database.pool.connect();
  const query: SqlSession['query'] = async <Row>(text: string, params: unknown[] = []) =>
    (await client.query(text, params)).rows as Row[];
  try {
    await client.query('begin');
    const result = await work({
      query,
      load: (table, columns, rows) => insertInBatches(query, table, columns, rows),
    });
    await client.query('commit');
    return result;
  } catch (error) {
    await client.query('rollback').catch(() => undefined);
    throw error;
  } finally {
    client.release();
  }
}
