import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { importRoster } from '../../server/imports/imports-service';
import { toRosterCsv, type RosterRow } from '@shared/roster';
import { inventedRoster } from '../bench/roster-import';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

// The demo district (1,670 students) and a file adding about 5,400 more: more than a bulk
// load's share of a roster is not reached (four times the roster), so before imports became one
// transaction this one landed its new students in slices, seen by every reader in between.
let app: TestApp;
let reader: ReturnType<TestApp['bearer']>;

beforeAll(async () => {
  app = await startTestApp();
  reader = app.bearer(await app.token(demoEmail('coordinator')));
});
afterAll(async () => {
  await app?.close();
});

async function query<Row>(text: string): Promise<Row[]> {
  return rowsOf<Row>(await app.database.db.execute(text as never));
}

const studentTotal = async () => {
  const response = await reader.get('/api/students?limit=1');
  expect(response.status).toBe(200);
  return (response.body as { total: number }).total;
};

/**
 * Runs `work` while readers ask for the roster's total, each asking again when answered; answers
 * every total they saw, and how many answers came while the work ran (so the test knows the
 * readers were really served during it).
 */
async function whileReading(work: () => Promise<unknown>) {
  const seen: number[] = [];
  let running = true;
  const readers = Array.from({ length: 3 }, async () => {
    while (running) seen.push(await studentTotal());
  });
  try {
    await work();
  } finally {
    running = false;
    await Promise.all(readers);
  }
  return seen;
}

const importFile = (rows: RosterRow[]) =>
  importRoster(
    app.database,
    {
      upload: { fileName: 'isolation.csv', bytes: new TextEncoder().encode(toRosterCsv(rows)) },
      withdrawMissing: false,
      skipInvalid: false,
    },
    null,
    { fileName: 'isolation.csv', via: 'cli' },
  );

const studentsOf = async (rows: RosterRow[]) =>
  (
    await query<{ count: number }>(
      `select count(*)::int as count from students
       where student_number in (${[...new Set(rows.map((row) => `'${row.studentId}'`))].join(', ')})`,
    )
  )[0]!.count;

describe('A large roster import seen by other users', () => {
  it('should show every reader the roster before it or after it, never part of it', async () => {
    const file = inventedRoster(6_000, 21, 870_000);
    const added = new Set(file.map((row) => row.studentId)).size;
    const before = await studentTotal();
    const seen = await whileReading(async () => {
      const outcome = await importFile(file);
      expect(outcome.result).toMatchObject({ committed: true, created: file.length });
    });
    expect(seen.length).toBeGreaterThan(0);
    expect(seen.filter((total) => total !== before && total !== before + added)).toEqual([]);
    expect(await studentTotal()).toBe(before + added);
  });

  it('should refuse a pass-off for a student of the import until it has committed', async () => {
    const file = inventedRoster(6_000, 22, 880_000);
    // The id the import's first new student will get: one past a value taken from the sequence.
    const [{ next }] = (await query<{ next: number }>(
      `select nextval(pg_get_serial_sequence('students', 'id'))::int + 1 as next`,
    )) as [{ next: number }];
    const ladder = await reader.get('/api/ladder');
    const requirement = ladder.body.rungs[0].requirements[0];
    const answers: number[] = [];
    let running = true;
    // Asked for again and again while the import runs.
    const writer = (async () => {
      while (running) {
        const response = await reader.post('/api/pass-offs', {
          studentId: next,
          requirementCode: requirement.code,
          heardOn: '2026-11-30',
          tempo: requirement.tempo,
          passed: true,
        });
        answers.push(response.status);
      }
    })();
    try {
      expect((await importFile(file)).result.committed).toBe(true);
    } finally {
      running = false;
      await writer;
    }
    expect(answers.length).toBeGreaterThan(0);
    // A request in flight at the commit may be answered after it and record the pass-off.
    expect(answers.filter((status) => status >= 500)).toEqual([]);
    const [student] = await query<{ student_number: string; early: number }>(
      `select s.student_number, (
         select count(*)::int from pass_offs p join audit_log a
           on a.entity = 'pass-off' and a.entity_id = p.id::text and a.action = 'create'
         where p.student_id = s.id
           and a.id < (select max(id) from audit_log where action = 'import')
       ) as early
       from students s where s.id = ${next}`,
    );
    // The id went to one of the file's students; no pass-off of theirs was recorded before the
    // import's own entry in the audit log (one sequence orders both).
    expect(file.some((row) => row.studentId === student?.student_number)).toBe(true);
    expect(student!.early).toBe(0);
  });

  it('should leave no trace, at any moment, of an import whose transaction fails', async () => {
    const file = inventedRoster(6_000, 23, 890_000);
    const counts = () =>
      query('select school_id, grade, status, students from student_counts order by 1, 2, 3');
    const countsBefore = await counts();
    const ensemblesBefore = await query('select id from ensembles order by id');
    const before = await studentTotal();
    // The history row is written last: a trigger refuses it (whatever the replication role).
    await query(
      `create function stop_import() returns trigger language plpgsql as $$
       begin raise exception 'The test stops this import.'; end $$`,
    );
    await query(
      `create trigger stop_import before insert on roster_imports
       for each row execute function stop_import()`,
    );
    await query('alter table roster_imports enable always trigger stop_import');
    let seen: number[];
    try {
      seen = await whileReading(() =>
        expect(importFile(file)).rejects.toThrow('The test stops this import.'),
      );
    } finally {
      await query('drop trigger stop_import on roster_imports');
      await query('drop function stop_import()');
    }
    expect(seen.length).toBeGreaterThan(0);
    expect(seen.filter((total) => total !== before)).toEqual([]);
    expect(await studentsOf(file)).toBe(0);
    expect(await counts()).toEqual(countsBefore);
    expect(await query('select id from ensembles order by id')).toEqual(ensemblesBefore);
  });
});
