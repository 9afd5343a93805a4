import { PGlite } from '@electric-sql/pglite';
import { drizzle as drizzlePglite } from 'drizzle-orm/pglite';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import { migrate as migrateNodePostgres } from 'drizzle-orm/node-postgres/migrator';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import fs from 'node:fs';
import path from 'node:path';
import type pg from 'pg';
import * as schema from './schema/index';
import { migrationsFolder } from '../project-paths';
import { preloadedPgliteArtifacts } from './pglite-preload';
import { inArrivalOrder } from './arrival-order';

/** The Drizzle database, whichever PostgreSQL is behind it. */
export type Database = PgDatabase<PgQueryResultHKT, typeof schema>;

/** A transaction handle; inside `db.transaction` use only this, never `db`. */
export type Transaction = Parameters<Parameters<Database['transaction']>[0]>[0];

/** An open database and how to close it. */
export interface DatabaseHandle {
  db: Database;
  kind: 'pglite' | 'postgres';
  /** The embedded engine, for COPY and dumps; absent in server mode. */
  pglite?: PGlite;
  pool?: pg.Pool;
  close(): Promise<void>;
}

/** Where to find the database: a data folder, a template image in memory, or a server. */
export type DatabaseLocation =
  | { kind: 'pglite'; dataDir: string }
  | { kind: 'pglite-image'; image: Blob }
  | { kind: 'pglite-memory' }
  | { kind: 'postgres'; url: string };

export { migrationsFolder };

/** Options for opening: a query logger lets benchmarks replay the exact SQL a route ran. */
export interface OpenOptions {
  logQuery?: (query: string, params: unknown[]) => void;
}

/**
 * How the embedded engine starts: PGlite's own parameters plus a 32 MB buffer pool instead of
 * PostgreSQL's default 128 MB. Setting up the pool is WebAssembly work that grows with its size
 * (measured here: one function took 485 ms of the start at 128 MB, 99 ms at 16 MB). The pool
 * caches pages of files the process reads back quickly (a local data folder, or memory), and the
 * benchmarks' pages and Overview figures did not slow with the smaller pool (tests/bench/NOTES.md,
 * start-up). PostgreSQL documentation, 19.4.1 "Memory": shared_buffers.
 */
export const pgliteStartParams = [...PGlite.defaultStartParams, '-c', 'shared_buffers=32MB'];

/** Opens the database without migrating it. */
export async function openDatabase(
  location: DatabaseLocation,
  options: OpenOptions = {},
): Promise<DatabaseHandle> {
  const logger = options.logQuery ? { logQuery: options.logQuery } : undefined;
  if (location.kind === 'postgres') {
    // Loaded only for a server: an embedded start does not pay for node-postgres.
    const [{ default: pg }, { drizzle: drizzleNodePostgres }] = await Promise.all([
      import('pg'),
      import('drizzle-orm/node-postgres'),
    ]);
    const pool = new pg.Pool({ connectionString: location.url, max: 10 });
    // An idle pooled connection the server closes (a restart, a failover, an administrator)
    // errors on the pool; node-postgres drops that client and the next query opens another.
    // Unheard, the error would end the process.
    pool.on('error', (error) => {
      process.stderr.write(`A pooled PostgreSQL connection closed: ${error.message}\n`);
    });
    const db = drizzleNodePostgres({ client: pool, schema, logger }) as unknown as Database;
    return closingAfterHousekeeping({ db, kind: 'postgres', pool }, () => pool.end());
  }
  let pglite: PGlite;
  if (location.kind === 'pglite') {
    const folder = path.join(location.dataDir, 'pg');
    fs.mkdirSync(folder, { recursive: true });
    pglite = await PGlite.create(folder, {
      startParams: pgliteStartParams,
      ...(await preloadedPgliteArtifacts()),
    });
  } else if (location.kind === 'pglite-image') {
    pglite = await PGlite.create({ loadDataDir: location.image, startParams: pgliteStartParams });
  } else {
    pglite = await PGlite.create({ startParams: pgliteStartParams });
  }
  await dropCompositeArrayParsers(pglite);
  inArrivalOrder(pglite);
  const db = drizzlePglite({ client: pglite, schema, logger }) as unknown as Database;
  return closingAfterHousekeeping({ db, kind: 'pglite', pglite }, async () => {
    if (!pglite.closed) await pglite.close();
  });
}

/** A handle whose `close()` first waits for its housekeeping (see {@link afterAnswering}). */
function closingAfterHousekeeping(
  opened: Omit<DatabaseHandle, 'close'>,
  closeEngine: () => Promise<void>,
): DatabaseHandle {
  const handle: DatabaseHandle = {
    ...opened,
    close: async () => {
      await housekeepingDone(handle);
      await closeEngine();
    },
  };
  return handle;
}

/**
 * Drops PGlite's parsers for arrays of composite types: on opening it registers one for every
 * array type, about 220 of them for the row types of PostgreSQL's own catalogs and views, which
 * no query of ours returns. Drizzle passes its own parsers with every query, and PGlite merges
 * the two sets by copying them for every statement: with all 318 entries that copy took
 * ~0.1 ms, a statement's whole round trip on a small query (measured, tests/bench/NOTES.md).
 * Arrays of base types (int[], text[], …) keep their parsers.
 */
async function dropCompositeArrayParsers(pglite: PGlite) {
  const { rows } = await pglite.query<{ oid: number }>(
    `select typarray::int as oid from pg_type where typtype = 'c' and typarray <> 0`,
  );
  const dropped = new Set(rows.map((row) => String(row.oid)));
  pglite.parsers = Object.fromEntries(
    Object.entries(pglite.parsers).filter(([oid]) => !dropped.has(oid)),
  );
}

/** Applies every committed migration that has not run yet. */
export async function migrateDatabase(handle: DatabaseHandle): Promise<void> {
  if (handle.kind === 'postgres') {
    await migrateNodePostgres(handle.db as never, { migrationsFolder });
  } else {
    // Imported up front: right after PGlite opens, V8 compiles its hot WebAssembly on the
    // background threads and a module read from disk then waited ~0.3 s (measured here).
    await migratePglite(handle.db as never, { migrationsFolder });
  }
}

/** A PostgreSQL array literal of whole numbers, sent as one parameter (`= any($1::int[])`). */
export const intArray = (ids: readonly number[]) => `{${ids.join(',')}}`;

/**
 * Runs queries one after the other and answers their results in order, as `Promise.all` would:
 * for work given a `Queryable` that may be a transaction, which is one connection running one
 * query at a time (node-postgres deprecates starting a query on a busy client).
 */
export async function oneByOne<const Work extends readonly (() => Promise<unknown>)[]>(
  ...work: Work
): Promise<{ -readonly [K in keyof Work]: Awaited<ReturnType<Work[K]>> }> {
  const results: unknown[] = [];
  for (const step of work) results.push(await step());
  return results as { -readonly [K in keyof Work]: Awaited<ReturnType<Work[K]>> };
}

/**
 * Waits for one turn of the event loop. A loop of statements that only awaits the embedded
 * engine never lets the HTTP server read a new request (each await resumes from the microtask
 * queue), so requests that arrive during the loop wait for its end however it is sliced;
 * between slices, call this. Node.js documentation: "The Node.js Event Loop".
 */
export function yieldToRequests(): Promise<void> {
  return new Promise((resolve) => setImmediate(resolve));
}

/** Each database's housekeeping still to run (see {@link afterAnswering}). */
const housekeeping = new WeakMap<DatabaseHandle, Promise<void>>();

/**
 * Runs `work` once the caller has answered (after one turn of the event loop), each database's
 * pieces one after another: upkeep a person need not wait for, such as gathering the planner's
 * statistics after a large import. A failure is written to the log and thrown to no one, since
 * the answer has gone; `close()` waits for everything queued. The work must leave nothing a
 * reader depends on half done (it is derived data, or it runs in one transaction).
 */
export function afterAnswering(
  database: DatabaseHandle,
  what: string,
  work: () => Promise<void>,
): void {
  const queued = housekeepingDone(database)
    .then(async () => {
      await yieldToRequests();
      await work();
    })
    .catch((error: unknown) => {
      process.stderr.write(
        `${what} failed: ${error instanceof Error ? error.message : String(error)}\n`,
      );
    });
  housekeeping.set(database, queued);
}

/** Settles when the housekeeping queued so far on `database` has run. */
export function housekeepingDone(database: DatabaseHandle): Promise<void> {
  return housekeeping.get(database) ?? Promise.resolve();
}

/** The rows of a raw `db.execute` result, for both drivers. */
export function rowsOf<Row>(result: unknown): Row[] {
  return (result as { rows: Row[] }).rows;
}
