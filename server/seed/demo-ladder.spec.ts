import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { migrateDatabase, openDatabase, rowsOf, type DatabaseHandle } from '../db/client';
import { seedDemo, demoSchoolYear } from './demo';
import { demoLastSchoolYear } from './demo-last-year';
import { lastDemoPassOffDay } from './demo-ladder';

const day = (iso: string) => Date.parse(`${iso}T00:00:00Z`);

describe('lastDemoPassOffDay', () => {
  it('should end the pass-offs the day before the demo is seeded', () => {
    expect(lastDemoPassOffDay(new Date('2027-03-10T18:30:00Z'), '2027-06-11')).toBe(
      day('2027-03-09'),
    );
  });

  it('should never end them before 30 November 2026 nor after the last day of the year', () => {
    expect(lastDemoPassOffDay(new Date('2026-10-02T08:00:00Z'), '2027-06-11')).toBe(
      day('2026-11-30'),
    );
    expect(lastDemoPassOffDay(new Date('2027-08-20T08:00:00Z'), '2027-06-11')).toBe(
      day('2027-06-11'),
    );
  });
});

describe('the demo district seeded on a later day', () => {
  let database: DatabaseHandle;
  // A Wednesday in March: the week of Monday 8 March has begun.
  const seededOn = new Date('2027-03-10T15:00:00Z');

  beforeAll(async () => {
    database = await openDatabase({ kind: 'pglite-memory' });
    await migrateDatabase(database);
    await seedDemo(database.db, seededOn);
  }, 120_000);

  afterAll(() => database.close());

  it('should hear its last pass-offs in the days before it was seeded, none after', async () => {
    const [row] = rowsOf<{ last: string; thisWeek: number; first: string }>(
      await database.db
        .execute(sql`select max(heard_on)::text as last, min(heard_on)::text as first,
        (count(*) filter (where heard_on >= '2027-03-08'))::int as "thisWeek" from pass_offs`),
    );
    // The demo's previous year is history: its pass-offs fall inside it, none in the summer.
    expect(row!.first >= demoLastSchoolYear.startsOn).toBe(true);
    const [summer] = rowsOf<{ heard: number }>(
      await database.db.execute(sql`select count(*)::int as heard from pass_offs
        where heard_on > ${demoLastSchoolYear.endsOn}::date and heard_on < ${demoSchoolYear.startsOn}::date`),
    );
    expect(summer!.heard).toBe(0);
    expect(row!.last <= '2027-03-09').toBe(true);
    expect(row!.last >= '2027-03-05').toBe(true);
    expect(row!.thisWeek).toBeGreaterThan(0);
  });

  it('should leave most students moving and some stalled (no pass-off in the last 30 days)', async () => {
    const [row] = rowsOf<{ students: number; stalled: number }>(
      await database.db.execute(sql`select count(*)::int as students,
        (count(*) filter (where last < '2027-02-08'))::int as stalled
        from (select p.student_id, max(p.heard_on) as last from pass_offs p
          join students st on st.id = p.student_id and st.status = 'active' group by p.student_id) s`),
    );
    expect(row!.students).toBeGreaterThan(1000);
    expect(row!.stalled / row!.students).toBeGreaterThan(0.1);
    expect(row!.stalled / row!.students).toBeLessThan(0.5);
  });
});
