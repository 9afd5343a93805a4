import { performance } from 'node:perf_hooks';
import { toRosterCsv, type RosterRow } from '@shared/roster';
import {
  housekeepingDone,
  migrateDatabase,
  openDatabase,
  type DatabaseHandle,
} from '../../server/db/client';
import { schoolYears, schools } from '../../server/db/schema/index';
import { importRoster } from '../../server/imports/imports-service';
import { copyText } from '../../server/imports/sql-session';
import { demoSchoolYear } from '../../server/seed/demo';
import { demoSchools, firstNames, lastNames } from '../../server/seed/demo-people';
import { SeededRandom } from '../../server/seed/random';
import { figure, type BenchFigure } from './bench-figure';

const ensembleNames = [
  'Concert Band',
  'Symphonic Band',
  'Jazz Band',
  'String Orchestra',
  'Percussion Ensemble',
  'Marching Band',
];
const instruments = [
  'flute',
  'Bb Clarinet',
  'Alto Saxophone',
  'trumpet',
  'French Horn',
  'trombone',
  'tuba',
  'violin',
  'cello',
];

/** An invented roster of about `count` rows over the demo schools; one student in ten has two ensembles. */
export function inventedRoster(count: number, seed = 7, firstNumber = 900_000): RosterRow[] {
  const random = new SeededRandom(seed);
  const rows: RosterRow[] = [];
  for (let number = firstNumber; rows.length < count; number += 1) {
    const school = random.pick(demoSchools);
    const lastName = random.pick(lastNames);
    const student: RosterRow = {
      studentId: `S${number}`,
      firstName: random.pick(firstNames),
      lastName,
      grade: 1 + (number % 12),
      schoolCode: school.code,
      guardianName: `${random.pick(firstNames)} ${lastName}`,
      guardianEmail: `family.${number}@families.merrowbasin.example`,
    };
    rows.push({
      ...student,
      ensemble: random.pick(ensembleNames),
      instrument: random.pick(instruments) as RosterRow['instrument'],
    });
    if (random.chance(0.1) && rows.length < count)
      rows.push({ ...student, ensemble: 'Jazz Band ' + (number % 3) });
  }
  return rows;
}

async function freshDistrict(): Promise<DatabaseHandle> {
  const database = await openDatabase({ kind: 'pglite-memory' });
  await migrateDatabase(database);
  await database.db
    .insert(schools)
    .values(demoSchools.map(({ code, name, level, address }) => ({ code, name, level, address })));
  await database.db.insert(schoolYears).values({ ...demoSchoolYear, current: true });
  return database;
}

async function timed(work: () => Promise<unknown>): Promise<number> {
  const started = performance.now();
  await work();
  return performance.now() - started;
}

/**
 * Imports an invented roster of `rows` rows end to end (parse, validate, plan, commit) into a
 * fresh migrated in-memory PGlite holding the demo schools, then re-imports it (every row
 * unchanged). The limit is the same students loaded with one plain `COPY … FROM '/dev/blob'` in
 * one transaction into a table like `students`.
 */
export async function benchRosterImport(options: { rows: number }): Promise<BenchFigure[]> {
  const database = await freshDistrict();
  try {
    const bytes = new TextEncoder().encode(toRosterCsv(inventedRoster(options.rows)));
    const run = (fileBytes: Uint8Array) =>
      importRoster(
        database,
        {
          upload: { fileName: 'bench.csv', bytes: fileBytes },
          withdrawMissing: false,
          skipInvalid: false,
        },
        null,
        { fileName: 'bench.csv', via: 'cli' },
      );
    // Warms the parser and the query plans on other students, as a server that has run a while.
    // The statistics that import gathers once it has answered are its own, not the next one's.
    await run(new TextEncoder().encode(toRosterCsv(inventedRoster(300, 3, 100))));
    await housekeepingDone(database);

    let firstResult: Awaited<ReturnType<typeof run>> | undefined;
    const importMs = await timed(async () => (firstResult = await run(bytes)));
    if (!firstResult?.result.committed)
      throw new Error(
        `The bench import did not commit: ${JSON.stringify(firstResult?.result.errors.slice(0, 3))}`,
      );
    // The planner's statistics, gathered once the import has answered (not in its time).
    const statisticsMs = await timed(() => housekeepingDone(database));
    let again: Awaited<ReturnType<typeof run>> | undefined;
    const reimportMs = await timed(async () => (again = await run(bytes)));
    await housekeepingDone(database);
    if (again?.result.unchanged !== options.rows) throw new Error('The re-import changed rows.');

    const students = [
      ...new Map(inventedRoster(options.rows).map((row) => [row.studentId, row])).values(),
    ];
    const staged = students.map((row) => [
      row.studentId,
      row.firstName,
      row.lastName,
      null,
      row.grade,
      1,
      row.guardianName ?? null,
      row.guardianEmail ?? null,
    ]);
    await database.pglite!.exec('create table copy_limit (like students including all)');
    const copyMs = await timed(() =>
      database.pglite!.transaction(async (transaction) => {
        await transaction.query(
          `copy copy_limit (student_number, first_name, last_name, preferred_name, grade, school_id, guardian_name, guardian_email) from '/dev/blob' with (format csv)`,
          [],
          { blob: new Blob([copyText(staged)]) },
        );
      }),
    );
    return [
      figure(
        `roster import, ${options.rows} rows`,
        importMs,
        copyMs,
        `parse, validate, plan and commit; target under 1500 ms for 20,000 rows; limit: plain COPY of ${students.length} students; then ${Math.round(statisticsMs)} ms of statistics after the answer`,
      ),
      figure(
        `roster re-import, ${options.rows} rows unchanged`,
        reimportMs,
        copyMs,
        'the same file again: nothing is written but the history row',
      ),
    ];
  } finally {
    await database.close();
  }
}
