import { sql } from 'drizzle-orm';
import type { Actor } from '../../server/core/policy';
import { rowsOf } from '../../server/db/client';
import {
  passOffsPerWeek,
  quietDirectors,
  stalledStudents,
} from '../../server/analytics/activity-figures';
import { daysBefore } from '../../server/analytics/analytics-scope';
import { auditionReady, listAttainment } from '../../server/analytics/attainment-lists';
import { overview } from '../../server/analytics/overview-service';
import { rungFigures, rungHistogram } from '../../server/analytics/rung-histogram';
import { rebuildAttainment } from '../../server/ladder/attainment';
import { activeRuleLadder } from '../../server/ladder/ladder-queries';
import { recordPassOffs } from '../../server/pass-offs/record-pass-offs';
import { benchDistrict, serveForBench } from './grid-pages';
import { figure, percentile, time, timings, type BenchFigure } from './bench-figure';
import { loadBenchPassOffs } from './analytics-load';

const asOf = '2026-12-01';
// The targets: every Overview figure under 50 ms, the whole Overview under 250 ms.
const target = 50;
const wholeTarget = 250;

/**
 * The Overview's ladder figures over `students` students and `passOffs` pass-offs, each timed
 * through the service (p95) against the same SQL run directly (p95) in the same run. Target:
 * every figure well under 100 ms. Prints EXPLAIN ANALYZE of the two slowest statements.
 */
export async function benchAnalytics(options: {
  students: number;
  passOffs: number;
}): Promise<BenchFigure[]> {
  const district = await benchDistrict(options.students);
  const { db } = district.database;
  const runs = options.students > 10_000 ? 20 : 5;
  const figures: BenchFigure[] = [];
  const explained: { name: string; ms: number; statement: { query: string; params: unknown[] } }[] =
    [];
  try {
    const progress = (step: string) =>
      process.stderr.write(
        `  analytics bench: ${step} (${Math.round(performance.now() / 1000)} s)\n`,
      );
    progress('district ready; loading pass-offs');
    await loadBenchPassOffs(district.database, options.passOffs);
    progress('pass-offs loaded; rebuilding the summary');
    const [counts] = rowsOf<{ students: number; pass_offs: number }>(
      await db.execute(
        sql`select (select count(*)::int from students) as students, (select count(*)::int from pass_offs) as pass_offs`,
      ),
    );
    const scale = `${counts!.students.toLocaleString('en-US')} students, ${counts!.pass_offs.toLocaleString('en-US')} pass-offs`;
    const rebuild = await time(() => db.transaction((tx) => rebuildAttainment(tx)));
    const aggregate = await time(() =>
      db.execute(
        sql`select p.student_id, p.requirement_code, max(p.tempo) from pass_offs p group by 1, 2`,
      ),
    );
    figures.push(
      figure(
        `rebuild every summary from the pass-offs (${scale})`,
        rebuild,
        aggregate,
        'seed and repair only; limit: the grouping query alone',
      ),
    );
    const publish = await time(() =>
      db.transaction((tx) => rebuildAttainment(tx, { from: 'summaries' })),
    );
    const scan = await time(() =>
      db.execute(sql`select student_id, count(*) from passed_requirements group by 1`),
    );
    figures.push(
      figure(
        `rebuild every rung on publish (${counts!.students.toLocaleString('en-US')} students)`,
        publish,
        scan,
        'once per published version; limit: one pass over passed_requirements',
      ),
    );
    await district.database.pglite!.query('ANALYZE');

    progress('timing the figures');
    const [coordinatorRow] = rowsOf<{ id: number }>(
      await db.execute(sql`select id from users where role = 'coordinator' order by id limit 1`),
    );
    const [directorRow] = rowsOf<{ id: number; school_id: number }>(
      await db.execute(
        sql`select u.id, us.school_id from users u join user_schools us on us.user_id = u.id where u.role = 'director' order by u.id limit 1`,
      ),
    );
    const coordinator: Actor = {
      userId: coordinatorRow!.id,
      email: 'coordinator@merrowbasin.example',
      name: 'Coordinator',
      role: 'coordinator',
      schoolIds: [],
      studentId: null,
      via: 'token',
    };
    const director: Actor = {
      userId: directorRow!.id,
      email: 'director@merrowbasin.example',
      name: 'Director',
      role: 'director',
      schoolIds: [directorRow!.school_id],
      studentId: null,
      via: 'token',
    };
    const ladder = (await activeRuleLadder(db))!;
    const [ensemble] = rowsOf<{ id: number }>(
      await db.execute(
        sql`select ensemble_id as id from enrollments group by 1 order by count(*) desc limit 1`,
      ),
    );

    // The service's own statements, captured from one call and then run directly on the engine.
    const measure = async (name: string, service: () => Promise<unknown>, note = '') => {
      const statements = await district.capture(service);
      const product = percentile(await timings(service, runs), 95);
      const runStatement = (statement: { query: string; params: unknown[] }) =>
        district.database.pglite!.query(statement.query, statement.params as never[]);
      const direct = percentile(
        await timings(async () => {
          for (const statement of statements) await runStatement(statement);
        }, runs),
        95,
      );
      figures.push(
        figure(
          `${name} (p95)`,
          product,
          direct,
          `target < ${target} ms: ${product < target ? 'met' : 'NOT met'}${note ? `; ${note}` : ''}`,
        ),
      );
      for (const statement of statements) {
        const ms = percentile(await timings(() => runStatement(statement), 3, 1), 50);
        explained.push({ name, ms, statement });
      }
    };

    const all = {};
    await measure(
      'students by rung, benchmark share, median (district)',
      async () => {
        const cells = await rungHistogram(db, coordinator, all);
        await rungFigures(db, cells, ladder.rungs.length, ladder.benchmarks, all, asOf);
      },
      'one aggregate over student_attainment',
    );
    await measure('students by rung, benchmark share, median (one school)', async () => {
      const cells = await rungHistogram(db, director, all);
      await rungFigures(db, cells, ladder.rungs.length, ladder.benchmarks, all, asOf);
    });
    await measure(
      'pass-offs per week (district)',
      () => passOffsPerWeek(db, coordinator, all, asOf),
      'from pass_off_weeks, kept on every write',
    );
    await measure(
      'pass-offs per week (one ensemble)',
      () => passOffsPerWeek(db, coordinator, { ensembleId: ensemble!.id }, asOf),
      'from pass_offs by heard_on',
    );
    await measure('stalled students (30 days)', () =>
      stalledStudents(db, coordinator, all, asOf, 30),
    );
    await measure('directors with no entries (30 days)', () =>
      quietDirectors(db, coordinator, all, asOf, 30),
    );
    await measure('drill: students below benchmark, first page', () =>
      listAttainment(db, coordinator, { belowBenchmark: 'true', asOf, limit: '100' }),
    );
    await measure(
      'audition-ready on three early scales',
      () =>
        auditionReady(db, coordinator, {
          requirementCodes: 'r1-bb-major,r2-bb-major,r3-c-major',
          limit: '100',
        }),
      'a worst case: passed by a fifth of the district',
    );
    await measure('audition-ready on three rung-5 scales', () =>
      auditionReady(db, coordinator, {
        requirementCodes: 'r5-bb-major,r5-f-major,r5-eb-major',
        limit: '100',
      }),
    );

    const server = await serveForBench(district.database);
    try {
      const product = percentile(
        await timings(() => server.get(`/api/analytics/overview?asOf=${asOf}`), runs),
        95,
      );
      const direct = percentile(await timings(() => overview(db, coordinator, { asOf }), runs), 95);
      figures.push(
        figure(
          'whole Overview through HTTP (p95)',
          product,
          direct,
          `limit: the service called in-process; target < ${wholeTarget} ms: ${product < wholeTarget ? 'met' : 'NOT met'}`,
        ),
      );
    } finally {
      await server.close();
    }

    const [pupil] = rowsOf<{ id: number; school_id: number }>(
      await db.execute(
        sql`select id, school_id from students where school_id = ${directorRow!.school_id} and status = 'active' order by id limit 1`,
      ),
    );
    let day = 0;
    const write = await timings(async () => {
      day += 1;
      await recordPassOffs(
        db,
        director,
        Array.from({ length: 30 }, () => ({
          studentId: pupil!.id,
          requirementCode: 'r1-bb-major',
          heardOn: daysBefore(asOf, day % 90),
          tempo: 60,
          passed: true,
          note: '',
        })),
      );
    }, runs);
    const plain = await timings(
      () =>
        db.execute(sql`insert into pass_offs (student_id, school_id, grade, ladder_version_id, requirement_code, heard_on, tempo, passed)
      select ${pupil!.id}, ${pupil!.school_id}, 8, ${ladder.versionId}, 'r1-bb-major', ${asOf}::date, 60, true from generate_series(1, 30)`),
      runs,
    );
    figures.push(
      figure(
        'record 30 pass-offs with summary upkeep (p95)',
        percentile(write, 95),
        percentile(plain, 95),
        'limit: the bare INSERT of 30 rows',
      ),
    );

    const slowest = [...explained].sort((first, second) => second.ms - first.ms).slice(0, 2);
    for (const entry of slowest) {
      const plan = await district.database.pglite!.query<Record<string, string>>(
        `explain analyze ${entry.statement.query}`,
        entry.statement.params as never[],
      );
      process.stdout.write(
        `\nEXPLAIN ANALYZE — ${entry.name} (${entry.ms.toFixed(1)} ms direct)\n${entry.statement.query.trim()}\n${plan.rows.map((row) => Object.values(row)[0]).join('\n')}\n`,
      );
    }
  } finally {
    await district.database.close();
  }
  return figures;
}
