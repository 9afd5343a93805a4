import { describe, expect, it } from 'vitest';
import { schoolYears, schools } from '../../server/db/schema/index';
import { demoSchoolYear } from '../../server/seed/demo';
import { demoSchools } from '../../server/seed/demo-people';
import { inventedRoster } from '../bench/roster-import';
import type { TestApp } from '../support/test-app';
import {
  expectHistoryToFail,
  importInSteps,
  query,
  rosterState,
  useTwoDistricts,
  watchCommit,
} from './import-differences-app';

describe("A district's first import", () => {
  // Two districts with schools and a year but no students yet.
  const districts = useTwoDistricts({ template: 'empty' }, async (app) => {
    await app.database.db
      .insert(schools)
      .values(
        demoSchools.map(({ code, name, level, address }) => ({ code, name, level, address })),
      );
    await app.database.db.insert(schoolYears).values({ ...demoSchoolYear, current: true });
  });

  const file = inventedRoster(2_400, 12, 860_000).map((row, index) =>
    index % 9 === 0 ? { ...row, ensemble: 'First Import Winds' } : row,
  );
  const indexes = (app: TestApp) =>
    query(
      app,
      `select tablename, indexname, indexdef from pg_indexes
       where tablename in ('students', 'student_attainment', 'enrollments') order by 2`,
    );
  const unusable = (app: TestApp) =>
    query(
      app,
      `select c.relname from pg_index i join pg_class c on c.oid = i.indexrelid
       where i.indrelid in ('students'::regclass, 'student_attainment'::regclass, 'enrollments'::regclass)
         and not (i.indisvalid and i.indisready)`,
    );

  it('should leave the indexes and the empty roster as they were when its final transaction fails', async () => {
    const { one: bulk } = districts;
    const before = await indexes(bulk);
    const watch = watchCommit(bulk);
    try {
      await expectHistoryToFail(bulk, () => importInSteps(bulk, file));
    } finally {
      watch.stop();
    }
    // It had dropped them (in PGlite) before its history row failed.
    const seen = await watch.seen();
    if (seen) expect(seen.droppedIndexes).toBeGreaterThan(10);
    expect(await indexes(bulk)).toEqual(before);
    expect(await unusable(bulk)).toEqual([]);
    expect(await query(bulk, 'select count(*)::int as count from students')).toEqual([
      { count: 0 },
    ]);
    expect(await query(bulk, 'select count(*)::int as count from student_attainment')).toEqual([
      { count: 0 },
    ]);
  });

  it('should add its students with the indexes built after, and end where two smaller imports end', async () => {
    const { one: bulk, other: stepwise } = districts;
    expect(new Set(file.map((row) => row.studentId)).size).toBeGreaterThan(2_000);
    const before = await indexes(bulk);
    const whole = await importInSteps(bulk, file);
    expect(whole.result).toMatchObject({ committed: true, created: file.length });
    // The same students in two imports, each adding fewer than a bulk load's least.
    const part = await importInSteps(stepwise, file.slice(0, 400));
    const rest = await importInSteps(stepwise, file);
    expect(rest.result).toMatchObject({ committed: true });
    if (bulk.database.kind === 'pglite') {
      // One transaction, no landing slices; every index that enforces nothing was dropped.
      expect(whole.transactions).toBe(1);
      const secondary = await query(
        bulk,
        `select 1 from pg_index i where i.indrelid in ('students'::regclass, 'student_attainment'::regclass, 'enrollments'::regclass)
           and not i.indisunique`,
      );
      expect(whole.droppedIndexes).toBe(secondary.length);
      expect(secondary.length).toBeGreaterThan(10);
      expect(part.droppedIndexes).toBe(0);
      expect(rest.droppedIndexes).toBe(0);
    }
    expect(await indexes(bulk)).toEqual(before);
    expect(await unusable(bulk)).toEqual([]);
    const end = async (app: TestApp) => {
      const { students, seats, counts, attainment } = await rosterState(app);
      return { students, seats, counts, attainment };
    };
    expect(await end(bulk)).toEqual(await end(stepwise));
    // The rebuilt indexes answer: a prefix search and a sort walk them.
    const [someone] = await query<{ last_name: string }>(
      bulk,
      'select last_name from students order by id desc limit 1',
    );
    await query(bulk, 'set enable_seqscan = off');
    const searched = await query<{ count: number }>(
      bulk,
      `select count(*)::int as count from students
       where lower(last_name) like '${someone!.last_name.toLowerCase()}%'`,
    );
    await query(bulk, 'reset enable_seqscan');
    const scanned = await query<{ count: number }>(
      bulk,
      `select count(*)::int as count from students
       where starts_with(lower(last_name), '${someone!.last_name.toLowerCase()}')`,
    );
    expect(searched[0]!.count).toBeGreaterThan(0);
    expect(searched).toEqual(scanned);
  });
});
