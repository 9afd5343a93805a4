import { afterAll, beforeAll, expect } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { commitImport, planUpload } from '../../server/imports/imports-service';
import { toRosterCsv, type RosterRow } from '@shared/roster';
import { startTestApp, type TestApp } from '../support/test-app';

/**
 * Two districts from the same template, started before a file's tests and closed after: the
 * same imports run in both, and what each leaves is compared. `prepare` runs on each once started.
 */
export function useTwoDistricts(
  options: Parameters<typeof startTestApp>[0] = {},
  prepare?: (app: TestApp) => Promise<void>,
) {
  const districts = {} as { one: TestApp; other: TestApp };
  beforeAll(async () => {
    [districts.one, districts.other] = await Promise.all([
      startTestApp(options),
      startTestApp(options),
    ]);
    for (const app of [districts.one, districts.other]) await prepare?.(app);
  });
  afterAll(async () => {
    await districts.one?.close();
    await districts.other?.close();
  });
  return districts;
}

export async function query<Row = Record<string, unknown>>(
  app: TestApp,
  text: string,
): Promise<Row[]> {
  return rowsOf<Row>(await app.database.db.execute(text as never));
}

/**
 * Watches a commit's transactions in PGlite: how many it ran, the existing students it staged
 * for comparison (the lines of its `COPY import_students`) and the indexes it dropped. On a server there is nothing
 * to watch (and no short cuts).
 */
export function watchCommit(app: TestApp) {
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
export async function importInSteps(
  app: TestApp,
  rows: RosterRow[],
  between?: () => Promise<unknown>,
) {
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
export async function rosterState(app: TestApp) {
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
export async function studentsState(app: TestApp, prefix: string) {
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
export async function expectHistoryToFail(app: TestApp, run: () => Promise<unknown>) {
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
