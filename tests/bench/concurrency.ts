import { toRosterCsv } from '@shared/roster';
import { housekeepingDone } from '../../server/db/client';
import { importRoster } from '../../server/imports/imports-service';
import { inventedRoster } from './roster-import';
import { benchDistrict, defaultTokenLimit, gridPages, serveForBench } from './grid-pages';
import { figure, percentile, type BenchFigure } from './bench-figure';
import { httpClients } from './http-clients';

/**
 * 20 simultaneous clients on grid pages while an import commits, against the same clients
 * without an import. PGlite runs one query at a time, so long statements stall every page.
 * Target: p95 ratio under 3.
 */
export async function benchConcurrency(options: {
  students: number;
  rows: number;
}): Promise<BenchFigure[]> {
  const district = await benchDistrict(options.students);
  const server = await serveForBench(district.database);
  const clients = httpClients(server.url, server.token);
  try {
    const paths = gridPages(district.schoolIds[0]!, options.students).map((page) => page.path);
    // One pass over every page first, so neither side pays for the first plans and compiles.
    for (const path of paths) await clients.sequential(path, 2);
    // At least 3 s, and past the production per-token limit: the load shares one token, so a
    // server that refused it at that limit would stop the run here, in the smoke run of
    // `npm test` as well as in a full run on a fast machine. A machine too slow to pass the limit
    // within a minute cannot trip it either; the wait ends after two minutes all the same.
    const quietClients = clients.start(paths, 20);
    const quietStarted = performance.now();
    await new Promise((resolve) => setTimeout(resolve, 3_000));
    while (
      (await server.requestsAnswered()) <= defaultTokenLimit &&
      performance.now() - quietStarted < 120_000
    )
      await new Promise((resolve) => setTimeout(resolve, 100));
    const quiet = await quietClients.stop();
    const quietSeconds = Math.round((performance.now() - quietStarted) / 1000);
    const roster = inventedRoster(options.rows, 11, 700_000);
    /** The pages' latencies while one import runs, with the import's own time and the longest wait. */
    const during = async (rows: typeof roster) => {
      const bytes = new TextEncoder().encode(toRosterCsv(rows));
      const busyClients = clients.start(paths, 20);
      // The clients' first requests are on their way before the import starts.
      await new Promise((resolve) => setTimeout(resolve, 50));
      const started = performance.now();
      const outcome = await importRoster(
        district.database,
        { upload: { fileName: 'bench.csv', bytes }, withdrawMissing: false, skipInvalid: false },
        null,
        { fileName: 'bench.csv', via: 'cli' },
      );
      if (!outcome.result.committed) throw new Error('The bench import did not commit.');
      const importMs = performance.now() - started;
      // The pages go on through the statistics the import gathers after its answer.
      await housekeepingDone(district.database);
      const busy = await busyClients.stop();
      return { busy, importMs, longest: Math.max(...busy), outcome: outcome.result };
    };
    const note = (busy: number[], longest: number) =>
      `target ratio < 3: ${percentile(busy, 95) / percentile(quiet, 95) < 3 ? 'met' : 'NOT met'}; ${busy.length} pages during (longest ${Math.round(longest)} ms), ${quiet.length} in ${quietSeconds} s without`;
    const first = await during(roster);
    // The nightly sync that follows: the same students, one in fifty with a new grade.
    const nightly = await during(
      roster.map((row) =>
        Number(row.studentId.slice(1)) % 50 === 0
          ? { ...row, grade: row.grade === 12 ? 11 : row.grade + 1 }
          : row,
      ),
    );
    return [
      figure(
        `grid p95 with 20 clients during a first import of ${options.rows.toLocaleString('en-US')} rows (${Math.round(first.importMs)} ms)`,
        percentile(first.busy, 95),
        percentile(quiet, 95),
        note(first.busy, first.longest),
      ),
      figure(
        `the same during a nightly re-import, ${nightly.outcome.updated.toLocaleString('en-US')} rows changed (${Math.round(nightly.importMs)} ms)`,
        percentile(nightly.busy, 95),
        percentile(quiet, 95),
        note(nightly.busy, nightly.longest),
      ),
    ];
  } finally {
    await clients.close();
    await server.close();
    await district.database.close();
  }
}
