import { sql, type SQL } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { readRosterSnapshot, snapshotSlice } from '../../server/imports/roster-snapshot';
import { startTestApp, type TestApp } from '../support/test-app';

let app: TestApp;

beforeAll(async () => {
  app = await startTestApp();
  // Enough students that the file and the schools are each read in several slices (in SQL, so
  // the suite runs on PostgreSQL servers too).
  await app.database.db.execute(sql`
    insert into students (student_number, first_name, last_name, grade, school_id)
    select 'SNAP' || g, 'First' || g % 97, 'Last' || g % 89, 4 + g % 9,
      (select id from schools order by id offset g % (select count(*) from schools) limit 1)
    from generate_series(1, ${2 * snapshotSlice + 500}::int) g`);
});
afterAll(() => app?.close());

type Row = Record<string, unknown>;
const query = async (text: SQL) => rowsOf<Row>(await app.database.db.execute(text));

describe('The roster snapshot an import is planned against', () => {
  it('should read every listed student, every student of the schools, and their seats, in slices', async () => {
    const listed = (await query(sql`select student_number from students order by random()`)).map(
      (row) => row['student_number'] as string,
    );
    expect(listed.length).toBeGreaterThan(2 * snapshotSlice);
    const file = [...listed.slice(0, 2 * snapshotSlice + 100), 'NOT-ON-ROLL-1'];
    // Every school: their students outnumber a slice, so they too are read in several.
    const codes = (await query(sql`select code from schools`)).map((row) => row['code'] as string);
    const snapshot = await readRosterSnapshot(app.database.db, file, codes, true);

    // Oracle: the same rows straight from the tables.
    const expected = await query(
      sql`select s.id, s.student_number as "studentNumber", s.first_name as "firstName",
         s.last_name as "lastName", s.preferred_name as "preferredName", s.grade,
         s.school_id as "schoolId", s.status, s.guardian_name as "guardianName",
         s.guardian_email as "guardianEmail"
       from students s join schools c on c.id = s.school_id
       where s.student_number = any(${sql.param(file)}::text[]) or c.code = any(${sql.param(codes)}::text[])`,
    );
    expect(snapshot.students.size).toBe(expected.length);
    for (const row of expected)
      expect(snapshot.students.get(row['studentNumber'] as string)).toEqual(row);

    const seats = await query(
      sql`select s.student_number as "studentNumber", en.ensemble_id as "ensembleId",
         en.instrument_id as "instrumentId", en.active
       from enrollments en join students s on s.id = en.student_id
         join school_years y on y.id = en.school_year_id and y.current
       where s.student_number = any(${sql.param(file)}::text[])`,
    );
    expect(seats.length).toBeGreaterThan(0);
    expect([...snapshot.seats.values()].reduce((sum, byEnsemble) => sum + byEnsemble.size, 0)).toBe(
      seats.length,
    );
    for (const seat of seats)
      expect(
        snapshot.seats.get(seat['studentNumber'] as string)?.get(seat['ensembleId'] as number),
      ).toEqual({ instrumentId: seat['instrumentId'], active: seat['active'] });
  });
});
