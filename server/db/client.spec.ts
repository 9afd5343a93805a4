import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { sql } from 'drizzle-orm';
import {
  afterAnswering,
  housekeepingDone,
  openDatabase,
  rowsOf,
  type DatabaseHandle,
} from './client';

describe('the embedded engine as opened', () => {
  let handle: DatabaseHandle;
  beforeAll(async () => {
    handle = await openDatabase({ kind: 'pglite-memory' });
  });
  afterAll(() => handle.close());

  it('keeps no parsers for arrays of composite types, and keeps those of base types', async () => {
    const pglite = handle.pglite!;
    const { rows } = await pglite.query<{ oid: number }>(
      `select typarray::int as oid from pg_type where typtype = 'c' and typarray <> 0`,
    );
    // PostgreSQL gives each catalog a row type (pg_class among them), each with an array type.
    expect(rows.length).toBeGreaterThan(100);
    for (const { oid } of rows) expect(pglite.parsers[oid]).toBeUndefined();
    // Fixed OIDs from PostgreSQL's pg_type.dat: int4[] 1007, text[] 1009, timestamptz 1184.
    for (const oid of [1007, 1009, 1184]) expect(pglite.parsers[oid]).toBeTypeOf('function');
  });

  it('still reads arrays of base types and timestamps', async () => {
    const [row] = rowsOf<{ ids: number[]; names: string[]; at: string | Date }>(
      await handle.db.execute(
        sql`select array[3, 1]::int[] as ids, array['a', 'b c']::text[] as names, timestamptz '2026-12-03 07:00:00+00' as at`,
      ),
    );
    expect(row!.ids).toEqual([3, 1]);
    expect(row!.names).toEqual(['a', 'b c']);
    // Drizzle has PGlite hand timestamps over as PostgreSQL's text (node-postgres gives a Date).
    expect(new Date(row!.at).toISOString()).toBe('2026-12-03T07:00:00.000Z');
  });

  it('decodes text fields from the message itself, not from a copy of each (patches/)', async () => {
    const slice = vi.spyOn(ArrayBuffer.prototype, 'slice');
    try {
      const { rows } = await handle.pglite!.query<string[]>(
        `select 'Zoë ' || n, 'Ōkafor', n::text, repeat('x', n) from generate_series(1, 200) n`,
        [],
        { rowMode: 'array' },
      );
      // Every field read right, multi-byte UTF-8 included (RFC 3629).
      expect(rows).toHaveLength(200);
      expect(rows[199]).toEqual(['Zoë 200', 'Ōkafor', '200', 'x'.repeat(200)]);
      // 800 fields; unpatched, PGlite copied each into its own ArrayBuffer before decoding it.
      expect(slice.mock.calls.length).toBeLessThan(50);
    } finally {
      slice.mockRestore();
    }
  });
});

// Each test opens an in-memory database (about 2 s on a loaded two-core machine).
describe('housekeeping after an answer', { timeout: 20_000 }, () => {
  it('runs after the caller goes on, in order, and close() waits for it', async () => {
    const handle = await openDatabase({ kind: 'pglite-memory' });
    const ran: string[] = [];
    afterAnswering(handle, 'first', async () => {
      await handle.db.execute(sql`create table noted (what text)`);
      ran.push('first');
    });
    afterAnswering(handle, 'second', async () => {
      await handle.db.execute(sql`insert into noted values ('second')`);
      ran.push('second');
    });
    // Nothing has run while the caller still holds the turn (it is answering).
    expect(ran).toEqual([]);
    await housekeepingDone(handle);
    expect(ran).toEqual(['first', 'second']);
    afterAnswering(handle, 'third', async () => {
      await handle.db.execute(sql`insert into noted values ('third')`);
      ran.push('third');
    });
    await handle.close();
    expect(ran).toEqual(['first', 'second', 'third']);
  });

  it('logs a failure, throws it to no one, and goes on with the next piece', async () => {
    const handle = await openDatabase({ kind: 'pglite-memory' });
    const log = vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
    try {
      const ran: string[] = [];
      afterAnswering(handle, 'Counting the missing table', async () => {
        await handle.db.execute(sql`select count(*) from no_such_table`);
      });
      afterAnswering(handle, 'next', async () => {
        ran.push('next');
      });
      await housekeepingDone(handle);
      expect(ran).toEqual(['next']);
      expect(log).toHaveBeenCalledWith(
        expect.stringMatching(/^Counting the missing table failed: .*no_such_table/),
      );
    } finally {
      log.mockRestore();
      await handle.close();
    }
  });
});
