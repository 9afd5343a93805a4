import { PGlite } from '@electric-sql/pglite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { copyText, type StagedValue } from './sql-session';

let pglite: PGlite;
// A fresh PGlite takes seconds to start on a busy machine.
beforeAll(async () => {
  pglite = await PGlite.create();
}, 60_000);
afterAll(() => pglite?.close());

describe('copyText', () => {
  it('should quote text, double its quotes and leave NULL as an empty field when writing CSV', () => {
    expect(copyText([['a"b', '', null, 7]])).toBe('"a""b","",,7\n');
    expect(copyText([])).toBe('');
  });

  // PostgreSQL COPY, CSV format: an unquoted empty field is NULL, a quoted one an empty string.
  it('should read back exactly when PostgreSQL copies the text in', async () => {
    const rows: StagedValue[][] = [
      ['Okonkwo-Reyes, Amara', 'line one\nline two', 12],
      ['', null, 0],
      ['"Kit"', '=1+2', null],
    ];
    await pglite.exec('create table staged (name text, note text, grade smallint)');
    await pglite.query(`copy staged from '/dev/blob' with (format csv)`, [], {
      blob: new Blob([copyText(rows)]),
    });
    const read = await pglite.query<{ name: string; note: string | null; grade: number | null }>(
      'select * from staged',
    );
    expect(read.rows.map((row) => [row.name, row.note, row.grade])).toEqual(rows);
  });
});
