import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { commitImport, planUpload } from '../../server/imports/imports-service';
import { settleUnfinishedImports } from '../../server/imports/landed-students';
import { rosterGeneration } from '../../server/imports/roster-snapshot';
import { schoolYears, schools } from '../../server/db/schema/index';
import { demoSchoolYear } from '../../server/seed/demo';
import { demoSchools } from '../../server/seed/demo-people';
import { toRosterCsv, type RosterRow } from '@shared/roster';
import { inventedRoster } from '../bench/roster-import';
import { startTestApp, type TestApp } from '../support/test-app';

// Two districts from the same template: the same imports run in both, one committing with the
// short cut (only the rows the plan found different) and one comparing every row again.
let shortCut: TestApp;
let everyRow: TestApp;

beforeAll(async () => {
  [shortCut, everyRow] = await Promise.all([startTestApp(), startTestApp()]);
});
afterAll(async () => {
  await shortCut?.close();
  await everyRow?.close();
});

async function query<Row = Record<string, unknown>>(app: TestApp, text: string): Promise<Row[]> {
  return rowsOf<Row>(await app.database.db.execute(text as never));
}

const generationOf = (app: TestApp) => rosterGeneration((text) => query(app, text));

/**
 * Watches a commit's transactions in PGlite: how many it ran, the existing students it staged
 * for comparison (the lines of its `COPY import_students`) and the indexes it dropped. On a server there is nothing
 * to watch (and no short cuts).
 */
function watchCommit(app: TestApp) {
  const pglite = app.database.pglite;
  const seen = { transactions: 0, staged: 0, droppedIndexes: 0 };
  if (!pglite) return { seen: async () => null, stop: () => undefined };
  const pending: Promise<void>[] = [];
  const transaction = pglite.transaction.bind(pglite);
  pglite.transaction = ((work: Parameters<typeof transaction>[0]) =>
    transaction((tx) => {
      seen.transactions += 1;
      const txQuery = tx.query.bind(tx);
      tx.query = ((text: string, params?: unknown[], options?: { blob?: Blob }) => {
        if (text.startsWith('drop index')) seen.droppedIndexes += 1;
        if (text.startsWith('copy import_students') && options?.blob)
          pending.push(
            options.blob.text().then((body) => {
              seen.staged += body.split('\n').filter(Boolean).length;
            }),
          );
        return txQuery(text, params, options);
      }) as typeof tx.query;
      return work(tx);
    })) as typeof pglite.transaction;
  return {
    seen: async () => {
      await Promise.all(pending);
      return seen;
    },
    stop: () => {
      pglite.transaction = transaction;
    },
  };
}

/** Plans an import, runs `between`, then commits the plan; answers the result and what was seen. */
async function importInSteps(app: TestApp, rows: RosterRow[], between?: () => Promise<unknown>) {
  const bytes = new TextEncoder().encode(toRosterCsv(rows));
  const plan = await planUpload(app.database, {
    upload: { fileName: 'roster.csv', bytes },
    withdrawMissing: false,
    skipInvalid: false,
  });
  await between?.();
  const watch = watchCommit(app);
  try {
    const result = await commitImport(app.database, plan, null, {
      fileName: 'roster.csv',
      via: 'cli',
    });
    const seen = await watch.seen();
    return {
      plan,
      result,
      staged: seen?.staged ?? null,
      transactions: seen?.transactions ?? null,
      droppedIndexes: seen?.droppedIndexes ?? null,
    };
  } finally {
    watch.stop();
  }
}

/** What an import leaves in the roster, by natural keys (ids and times left out). */
async function rosterState(app: TestApp) {
  return {
    students: await query(
      app,
      `select s.student_number, s.first_name, s.last_name, s.preferred_name, s.grade, c.code, s.status,
         s.guardian_name, s.guardian_email, s.version
       from students s join schools c on c.id = s.school_id order by s.student_number`,
    ),
    seats: await query(
      app,
      `select s.student_number, c.code, e.name, en.instrument_id, en.active, en.version
       from enrollments en join students s on s.id = en.student_id
         join ensembles e on e.id = en.ensemble_id join schools c on c.id = e.school_id
       order by 1, 2, 3`,
    ),
    moves: await query(
      app,
      `select s.student_number, f.code as from_code, t.code as to_code from school_moves m
       join students s on s.id = m.student_id join schools f on f.id = m.from_school_id
       join schools t on t.id = m.to_school_id order by 1`,
    ),
    audited: await query(
      app,
      `select action, entity, count(*)::int as entries from audit_log group by 1, 2 order by 1, 2`,
    ),
    // What each import's summary entry says it did, ensembles created included.
    imports: await query(
      app,
      `select after - 'fileName' - 'via' as summary from audit_log
       where action = 'import' order by id`,
    ),
    counts: await query(
      app,
      `select c.code, n.grade, n.status, n.students from student_counts n
       join schools c on c.id = n.school_id where n.students <> 0 order by 1, 2, 3`,
    ),
    attainment: await query(
      app,
      `select s.student_number, c.code, a.grade, a.active from student_attainment a
       join students s on s.id = a.student_id join schools c on c.id = a.school_id order by 1`,
    ),
  };
}

/** The part of {@link rosterState} about the students whose numbers start with `prefix`. */
async function studentsState(app: TestApp, prefix: string) {
  const full = await rosterState(app);
  const mine = (row: Record<string, unknown>) => String(row['student_number']).startsWith(prefix);
  return {
    students: full.students.filter(mine),
    seats: full.seats.filter(mine),
    attainment: full.attainment.filter(mine),
  };
}

/**
 * Runs an import while its history row, written last in the final transaction, fails (a
 * trigger that fires whatever the session's replication role), and expects it to be refused.
 */
async function expectHistoryToFail(app: TestApp, run: () => Promise<unknown>) {
  await query(
    app,
    `create function stop_import() returns trigger language plpgsql as $$
     begin raise exception 'The test stops this import.'; end $$`,
  );
  await query(
    app,
    `create trigger stop_import before insert on roster_imports
     for each row execute function stop_import()`,
  );
  await query(app, 'alter table roster_imports enable always trigger stop_import');
  try {
    await expect(run()).rejects.toThrow('The test stops this import.');
  } finally {
    await query(app, 'drop trigger stop_import on roster_imports');
    await query(app, 'drop function stop_import()');
  }
}

const first = inventedRoster(240, 5, 810_000);
const firstStudents = [...new Set(first.map((row) => row.studentId))];
const withdrawnBefore = firstStudents.filter((_, index) => index % 50 === 7);

/** The next file: a few of every kind of change, most rows as they were, and new students. */
function nextFile(): RosterRow[] {
  const otherSchool = (code: string) => demoSchools.find((school) => school.code !== code)!.code;
  // Student fields change on every row of the student (a file's rows must agree on them);
  // seats change row by row.
  const rows = first.map((row, index): RosterRow => {
    const student = firstStudents.indexOf(row.studentId);
    if (student % 40 === 1) return { ...row, firstName: `${row.firstName}a` };
    if (student % 40 === 2) return { ...row, grade: row.grade === 12 ? 11 : row.grade + 1 };
    if (student % 40 === 3) return { ...row, schoolCode: otherSchool(row.schoolCode) };
    if (student % 40 === 6)
      return { ...row, guardianEmail: `changed.${student}@families.merrowbasin.example` };
    if (index % 40 === 4)
      return { ...row, instrument: row.instrument === 'violin' ? 'cello' : 'violin' };
    if (index % 40 === 5) return { ...row, ensemble: 'Differences Winds' };
    return row;
  });
  // A second seat for one student whose first row is unchanged.
  rows.push({ ...first[10]!, ensemble: 'Differences Strings', instrument: 'cello' });
  return [...rows, ...inventedRoster(20, 6, 820_000)];
}

describe('A roster import whose plan still holds', () => {
  it('should write only the rows the plan found different, and leave what comparing every row leaves', async () => {
    for (const app of [shortCut, everyRow]) {
      const base = await importInSteps(app, first);
      expect(base.result.created).toBe(first.length);
      await query(
        app,
        `update students set status = 'withdrawn'
         where student_number in (${withdrawnBefore.map((number) => `'${number}'`).join(', ')})`,
      );
    }
    const file = nextFile();
    const fast = await importInSteps(shortCut, file);
    expect(fast.plan.errors).toEqual([]);
    // Any write between the plan and the commit (here only the sequence itself) makes the
    // commit compare every row again.
    const slow = await importInSteps(everyRow, file, () =>
      query(everyRow, `select nextval('roster_generation')`),
    );

    const { created, updated, unchanged } = fast.plan.counts;
    expect(fast.result).toMatchObject({ committed: true, created, updated, unchanged });
    expect(updated).toBeGreaterThan(withdrawnBefore.length);
    expect(slow.result).toEqual({ ...fast.result, importId: slow.result.importId });
    expect(await rosterState(shortCut)).toEqual(await rosterState(everyRow));

    if (shortCut.database.kind === 'pglite') {
      // The short cut staged only the existing students whose own fields or status differ.
      const changedStudents = new Set(
        fast.plan.updatedStudents
          .filter((student) =>
            student.changes.some(
              (change) => change.field !== 'ensemble' && change.field !== 'instrument',
            ),
          )
          .map((student) => student.studentId),
      );
      expect(changedStudents.size).toBeGreaterThan(withdrawnBefore.length);
      expect(fast.staged).toBe(changedStudents.size);
      expect(slow.staged).toBe(firstStudents.length);
    } else {
      // On a PostgreSQL server every row is compared again.
      expect(fast.staged).toBeNull();
    }
  });

  it('should compare every row again when the roster changed after the plan read it', async () => {
    const file = nextFile();
    const [student] = firstStudents;
    const inFile = file.find((row) => row.studentId === student)!;
    const again = await importInSteps(shortCut, file, () =>
      // A director's edit lands between the plan's reads and the commit.
      query(
        shortCut,
        `update students set first_name = 'Edited' where student_number = '${student}'`,
      ),
    );
    // The plan saw nothing to do; the commit put the file's name back all the same.
    expect(again.plan.counts.updated).toBe(0);
    expect(again.result).toMatchObject({ committed: true, created: 0, updated: 1 });
    const [row] = await query<{ first_name: string }>(
      shortCut,
      `select first_name from students where student_number = '${student}'`,
    );
    expect(row!.first_name).toBe(inFile.firstName);
  });

  it('should move the roster generation with every write to what an import compares, and only then', async () => {
    const app = shortCut;
    const writes = [
      `update students set guardian_name = guardian_name where student_number = '${firstStudents[1]}'`,
      `update enrollments set active = active where id = (select min(id) from enrollments)`,
      `update ensembles set name = name where id = (select min(id) from ensembles)`,
      `update schools set name = name where id = (select min(id) from schools)`,
      `update school_years set name = name where id = (select min(id) from school_years)`,
    ];
    for (const write of writes) {
      const before = await generationOf(app);
      await query(app, write);
      expect(await generationOf(app), write).not.toBe(before);
    }
    const before = await generationOf(app);
    await query(
      app,
      `insert into audit_log (user_id, action, entity, entity_id) values (null, 'note', 'test', '1')`,
    );
    await query(app, `select count(*) from students`);
    expect(await generationOf(app)).toBe(before);
  });
});

describe('A large roster import', () => {
  // Some rows name an ensemble no school has yet. More new students than a bulk load's least,
  // fewer than four times the roster: written with every index in place.
  const largeFile = inventedRoster(4_800, 9, 830_000).map((row, index) =>
    index % 7 === 0 ? { ...row, ensemble: 'Landing Strings' } : row,
  );
  const largeFileStudents = new Set(largeFile.map((row) => row.studentId)).size;
  const studentsOfFile = async (app: TestApp, rows: RosterRow[]) =>
    (
      await query<{ count: number }>(
        app,
        `select count(*)::int as count from students
         where student_number in (${[...new Set(rows.map((row) => `'${row.studentId}'`))].join(', ')})`,
      )
    )[0]!.count;
  const landingRows = async (app: TestApp) =>
    (
      await query<{ count: number }>(
        app,
        'select count(*)::int as count from roster_import_landings',
      )
    )[0]!.count;

  it('should add its new students in its one transaction, and end where comparing every row ends', async () => {
    expect(largeFileStudents).toBeGreaterThan(4_000);
    const counts = (app: TestApp) =>
      query<{ code: string; grade: number; status: string; students: number }>(
        app,
        `select c.code, n.grade, n.status, n.students from student_counts n
         join schools c on c.id = n.school_id order by 1, 2, 3`,
      );
    const countsBefore = await Promise.all([counts(shortCut), counts(everyRow)]);
    const withShortCut = await importInSteps(shortCut, largeFile);
    const comparingAll = await importInSteps(everyRow, largeFile, () =>
      query(everyRow, `select nextval('roster_generation')`),
    );
    expect(withShortCut.result).toMatchObject({ committed: true, created: largeFile.length });
    expect(comparingAll.result).toEqual({
      ...withShortCut.result,
      importId: comparingAll.result.importId,
    });
    expect(await studentsState(shortCut, 'S83')).toEqual(await studentsState(everyRow, 'S83'));
    const lastSummary = async (app: TestApp) => (await rosterState(app)).imports.at(-1);
    expect(await lastSummary(shortCut)).toEqual(await lastSummary(everyRow));
    expect((await lastSummary(shortCut))!['summary']).toMatchObject({
      newEnsembles: expect.arrayContaining(['Landing Strings']),
    });
    // The per-school counts moved by the same amounts in both.
    const added = async (app: TestApp, before: Awaited<ReturnType<typeof counts>>) =>
      (await counts(app)).map((row) => ({
        ...row,
        students:
          row.students -
          (before.find(
            (old) => old.code === row.code && old.grade === row.grade && old.status === row.status,
          )?.students ?? 0),
      }));
    expect(await added(shortCut, countsBefore[0])).toEqual(await added(everyRow, countsBefore[1]));
    if (shortCut.database.kind === 'pglite') {
      // Nothing is written ahead of the transaction that commits, and no index is dropped.
      expect(withShortCut.transactions).toBe(1);
      expect(comparingAll.transactions).toBe(1);
      expect(withShortCut.droppedIndexes).toBe(0);
    }
  });

  it('should leave no student, ensemble or count behind when its transaction fails', async () => {
    const file = inventedRoster(2_400, 10, 840_000).map((row) => ({
      ...row,
      ensemble: row.ensemble ? `${row.ensemble} Taken Back` : row.ensemble,
    }));
    const ensemblesBefore = await query(shortCut, 'select id from ensembles order by id');
    const countsBefore = await query(
      shortCut,
      'select school_id, grade, status, students from student_counts order by 1, 2, 3',
    );
    await expectHistoryToFail(shortCut, () => importInSteps(shortCut, file));
    expect(await studentsOfFile(shortCut, file)).toBe(0);
    expect(await query(shortCut, 'select id from ensembles order by id')).toEqual(ensemblesBefore);
    expect(
      await query(
        shortCut,
        'select school_id, grade, status, students from student_counts order by 1, 2, 3',
      ),
    ).toEqual(countsBefore);
  });

  // Imports once landed new students ahead of their final transaction; a data folder a crash
  // left in the middle of one still has them, noted in roster_import_landings.
  it('should take back at the next start what a crash left landed, keeping students someone has worked with', async () => {
    const app = everyRow;
    const [kept, gone] = await query<{ id: number; school_id: number; grade: number }>(
      app,
      `select id, school_id, grade from students where student_number in ('S830000', 'S830001') order by student_number`,
    );
    await query(
      app,
      `insert into pass_offs (student_id, school_id, grade, ladder_version_id, requirement_code, heard_on, tempo, passed)
       select ${kept!.id}, ${kept!.school_id}, ${kept!.grade}, min(id), 'bb-major', '2026-11-02', 72, true from ladder_versions`,
    );
    await query(
      app,
      `insert into roster_import_landings (run, student_id) values ('crashed', ${kept!.id}), ('crashed', ${gone!.id})`,
    );
    expect(await settleUnfinishedImports(app.database)).toBe(1);
    const left = await query<{ id: number }>(
      app,
      `select id from students where id in (${kept!.id}, ${gone!.id})`,
    );
    expect(left).toEqual([{ id: kept!.id }]);
    expect(await landingRows(app)).toBe(0);
    expect(await settleUnfinishedImports(app.database)).toBe(0);
  });
});

describe("A district's first import", () => {
  // Two districts with schools and a year but no students yet.
  let bulk: TestApp;
  let stepwise: TestApp;
  beforeAll(async () => {
    [bulk, stepwise] = await Promise.all([
      startTestApp({ template: 'empty' }),
      startTestApp({ template: 'empty' }),
    ]);
    for (const app of [bulk, stepwise]) {
      await app.database.db
        .insert(schools)
        .values(
          demoSchools.map(({ code, name, level, address }) => ({ code, name, level, address })),
        );
      await app.database.db.insert(schoolYears).values({ ...demoSchoolYear, current: true });
    }
  });
  afterAll(async () => {
    await bulk?.close();
    await stepwise?.close();
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
