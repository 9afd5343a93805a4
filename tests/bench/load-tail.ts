import { rowsOf } from '../../server/db/client';
import { figure, percentile, type BenchFigure } from './bench-figure';
import { benchDistrict, serveForBench } from './grid-pages';
import { runLoad, type LoadMix, type LoadResult } from './load-mix';

const mean = (values: number[]) => values.reduce((sum, value) => sum + value, 0) / values.length;

/**
 * `clients` clients on the demo district for `seconds` (70 % reads of the grids and the
 * Overview, 25 % batches of pass-offs, 5 % student edits, each client sending its next request
 * when the last is answered), against one client running the same mix back to back. The embedded
 * engine answers one statement at a time, so the clients queue: in a fair queue each waits about
 * `clients` × the one client's mean (Little's law), the limit of the tail figures. Then requests
 * arrive at half the throughput measured, whatever is unanswered (an open arrival). Targets: no
 * error and no lost write; throughput at least 90 % of the one client's; p99 at most 2× and the
 * longest at most 3× the fair queue's wait; p99 of the open arrival under 100 ms.
 */
export async function benchLoadTail(options: {
  clients: number;
  seconds: number;
}): Promise<BenchFigure[]> {
  const district = await benchDistrict(0);
  const server = await serveForBench(district.database);
  const query = async <Row>(text: string) =>
    rowsOf<Row>(await district.database.db.execute(text as never));
  try {
    const ladder = (await server.get('/api/ladder')) as {
      rungs: { requirements: { code: string; tempo: number }[] }[];
    };
    const active = await query<{ id: number; version: number }>(
      `select id, version from students where status = 'active' order by id`,
    );
    const heardOn = new Date(Date.now() - 7 * 86_400_000).toISOString().slice(0, 10);
    const [school] = await query<{ id: number }>('select min(id)::int as id from schools');
    const perClient = 5;
    /** Each client's own students to edit, with their versions as they are now. */
    const editable = async () => {
      const versions = new Map(
        (await query<{ id: number; version: number }>('select id, version from students')).map(
          (row) => [row.id, row.version],
        ),
      );
      return Array.from({ length: Math.max(options.clients, 60) }, (_, client) =>
        active
          .slice(client * perClient, (client + 1) * perClient)
          .map((student) => ({ id: student.id, version: versions.get(student.id)! })),
      );
    };
    const mix: LoadMix = {
      base: server.url,
      token: server.token,
      reads: [
        '/api/students?limit=100',
        '/api/students?limit=100&sort=grade:asc',
        `/api/students?limit=100&schoolId=${school!.id}`,
        '/api/pass-offs?limit=100',
        '/api/enrollments?limit=100',
        '/api/ensembles?limit=100',
        `/api/analytics/overview?asOf=${heardOn}`,
      ],
      requirements: ladder.rungs.slice(0, 4).flatMap((rung) => rung.requirements),
      students: active.slice(1_000).map((student) => student.id),
      editable: [],
      heardOn,
      mix: { reads: 0.7, passOffs: 0.25, batch: 10 },
    };
    // Every path once, so neither run pays for the first plans.
    for (const path of mix.reads) await server.get(path);
    const counted = async () => {
      const [row] = await query<{ pass_offs: number; versions: number }>(
        `select (select count(*)::int from pass_offs) as pass_offs,
           (select coalesce(sum(version), 0)::int from students) as versions`,
      );
      return row!;
    };
    /** Runs the load; answers what it saw and the writes the database lacks of those acknowledged. */
    const measured = async (run: Parameters<typeof runLoad>[1]) => {
      const before = await counted();
      const result = await runLoad({ ...mix, editable: await editable() }, run);
      const after = await counted();
      const lost =
        result.passOffs -
        (after.pass_offs - before.pass_offs) +
        (result.edits - (after.versions - before.versions));
      return { result, lost };
    };
    const alone = await measured({ clients: 1, seconds: options.seconds / 3, seed: 1 });
    const crowd = await measured({ clients: options.clients, seconds: options.seconds, seed: 100 });
    const throughput = (result: LoadResult) => (result.requests * 1000) / result.elapsedMs;
    const aloneMean = mean(alone.result.latencies);
    const fairWait = options.clients * aloneMean;
    const open = await measured({
      rate: throughput(crowd.result) / 2,
      seconds: options.seconds / 3,
      seed: 7,
    });
    const errors = [alone, crowd, open].flatMap(({ result }) => result.errors);
    const lost = alone.lost + crowd.lost + open.lost;
    const latencies = crowd.result.latencies;
    const met = (ok: boolean) => (ok ? 'met' : 'NOT met');
    const ratio = throughput(crowd.result) / throughput(alone.result);
    return [
      figure(
        `throughput with ${options.clients} clients, requests a second`,
        throughput(crowd.result),
        throughput(alone.result),
        `limit: one client, same mix; target ≥ 0.9: ${met(ratio >= 0.9)}; ${crowd.result.requests} requests, ${errors.length} errors${errors[0] ? ` (first: ${errors[0]})` : ''}, ${lost} lost writes (${crowd.result.passOffs} pass-offs and ${crowd.result.edits} edits acknowledged)`,
        'req/s',
      ),
      figure(
        `p99 with ${options.clients} clients`,
        percentile(latencies, 99),
        fairWait,
        `limit: fair queue's wait, ${options.clients} × one client's mean of ${aloneMean.toFixed(1)} ms; target ≤ 2: ${met(percentile(latencies, 99) <= 2 * fairWait)}; p50 ${percentile(latencies, 50).toFixed(0)} ms, p95 ${percentile(latencies, 95).toFixed(0)} ms`,
      ),
      figure(
        `longest with ${options.clients} clients`,
        Math.max(...latencies),
        fairWait,
        `target ≤ 3: ${met(Math.max(...latencies) <= 3 * fairWait)}`,
      ),
      figure(
        `p99 at an open arrival of ${(throughput(crowd.result) / 2).toFixed(0)} a second (half the throughput)`,
        percentile(open.result.latencies, 99),
        100,
        `limit: the 100 ms target; target < 1: ${met(percentile(open.result.latencies, 99) < 100)}; one client's mean ${aloneMean.toFixed(1)} ms`,
      ),
    ];
  } finally {
    await server.close();
    await district.database.close();
  }
}
