import { toRosterCsv } from '../../shared/roster';
import { importRoster } from '../../server/imports/import-service';
import { inventedRoster } from './roster-import';
import { benchDistrict, gridPages, serveForBench } from './grid-pages';
import { figure, percentile, type BenchFigure } from './bench-figure';

/** `clients` loops of grid page requests until `done()`; answers every latency. */
async function clientsUntil(
  clients: number,
  get: (path: string) => Promise<unknown>,
  paths: string[],
  done: () => boolean,
): Promise<number[]> {
  const latencies: number[] = [];
  await Promise.all(
    Array.from({ length: clients }, async (_, client) => {
      for (let request = 0; !done(); request += 1) {
        const start = performance.now();
        await get(paths[(client + request) % paths.length]!);
        latencies.push(performance.now() - start);
      }
    }),
  );
  return latencies;
}

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
  try {
    const paths = gridPages(district.schoolIds[0]!, options.students).map((page) => page.path);
    // One pass over every page first, so neither side pays for the first plans and compiles.
    for (const path of paths) await server.get(path);
    const quietUntil = performance.now() + 3_000;
    const quiet = await clientsUntil(20, server.get, paths, () => performance.now() > quietUntil);
    let importing = true;
    const bytes = new TextEncoder().encode(toRosterCsv(inventedRoster(options.rows, 11, 700_000)));
    const started = performance.now();
    const [busy] = await Promise.all([
      clientsUntil(20, server.get, paths, () => !importing),
      importRoster(
        district.database,
        { upload: { fileName: 'bench.csv', bytes }, withdrawMissing: false, skipInvalid: false },
        null,
        { fileName: 'bench.csv', via: 'cli' },
      ).finally(() => (importing = false)),
    ]);
    const importMs = performance.now() - started;
    return [
      figure(
        `grid p95 with 20 clients during a ${options.rows.toLocaleString('en-US')}-row import (${Math.round(importMs)} ms)`,
        percentile(busy, 95),
        percentile(quiet, 95),
        `target ratio < 3: ${percentile(busy, 95) / percentile(quiet, 95) < 3 ? 'met' : 'NOT met'}; ${busy.length} pages during, ${quiet.length} in 3 s without`,
      ),
    ];
  } finally {
    await server.close();
    await district.database.close();
  }
}
