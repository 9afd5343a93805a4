import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PGlite } from '@electric-sql/pglite';
import { dropSecondaryIndexes } from './bulk-load';

describe('dropping the indexes that read some columns', () => {
  let pglite: PGlite;
  const run = async (text: string) => (await pglite.query<Record<string, unknown>>(text)).rows;
  const indexNames = async () =>
    (await run(`select indexname from pg_indexes where tablename = 't' order by indexname`)).map(
      (row) => row['indexname'],
    );

  beforeAll(async () => {
    pglite = new PGlite();
    await pglite.exec(`
      create table t (id int primary key, code text unique, a int, b text, c int, d text);
      create index t_a on t (a, b);
      create index t_lower_b on t (lower(b) text_pattern_ops);
      create index t_c_where on t (id) where c > 0;
      create index t_d on t (d);
      insert into t select n, 'x' || n, n % 7, 'name ' || n, n % 2, 'd' || n from generate_series(1, 100) n;`);
  }, 120_000);
  afterAll(() => pglite.close());

  it('drops those reading a column as a key, in an expression or in a predicate, and builds them again', async () => {
    await pglite.exec('begin');
    const definitions = await dropSecondaryIndexes(run, ['t'], ['b', 'c']);
    // A column in a key (t_a), an expression (t_lower_b) or a WHERE clause (t_c_where) makes the
    // index depend on it (PostgreSQL manual, pg_depend: an index's normal dependencies on its
    // table's columns); t_d and the unique and key indexes stay.
    expect(definitions.map((definition) => definition.split(' ')[2])).toEqual([
      't_a',
      't_c_where',
      't_lower_b',
    ]);
    expect(await indexNames()).toEqual(['t_code_key', 't_d', 't_pkey']);
    // The same update is then heap-only for every row on pages with room: no index reads b or c.
    await run(`update t set b = b || '!', c = c + 1`);
    for (const definition of definitions) await run(definition);
    expect(await indexNames()).toEqual([
      't_a',
      't_c_where',
      't_code_key',
      't_d',
      't_lower_b',
      't_pkey',
    ]);
    await pglite.exec('commit');
    // Built after heap-only updates in the same transaction, an index is used only by later
    // transactions (PostgreSQL's README.HOT, "CREATE INDEX": pg_index.indcheckxmin); after the
    // commit it answers the prefix search (the table is too small for the planner to choose it
    // unasked).
    await pglite.exec('begin');
    await run('set local enable_seqscan = off');
    const [plan] = await run(`explain (costs off) select id from t where lower(b) like 'name 1%'`);
    expect(Object.values(plan!)[0]).toContain('t_lower_b');
    await pglite.exec('rollback');
  });

  it('drops every secondary index without columns', async () => {
    await pglite.exec('begin');
    await dropSecondaryIndexes(run, ['t']);
    expect(await indexNames()).toEqual(['t_code_key', 't_pkey']);
    await pglite.exec('rollback');
    expect(await indexNames()).toHaveLength(6);
  });
});
