import { createHttpServer } from '../../server/core/http-server';
import type { AddressInfo } from 'node:net';
import { eq } from 'drizzle-orm';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { migrateDatabase, openDatabase, type DatabaseHandle } from '../../server/db/client';
import { schools, users } from '../../server/db/schema/index';
import { createLogger } from '../../server/logger';
import { seedDemo } from '../../server/seed/demo';
import { issueToken } from '../../server/tokens/tokens-service';
import { loadBenchStudents } from './bench-district';
import { httpClients } from './http-clients';
import { figure, percentile, timings, type BenchFigure } from './bench-figure';

/**
 * The mail worker and the report scheduler poll on their own timers (server/reports/
 * background-work.ts); a statement of theirs that lands inside a capture is not the work's.
 */
const backgroundStatement = /\b(outbox_messages|report_schedules)\b/;

/** A migrated in-memory district with the demo seed plus `students` generated students. */
export async function benchDistrict(students: number) {
  const captured: { query: string; params: unknown[] }[] = [];
  let capturing = false;
  const database = await openDatabase(
    { kind: 'pglite-memory' },
    { logQuery: (query, params) => capturing && captured.push({ query, params }) },
  );
  await migrateDatabase(database);
  await seedDemo(database.db);
  const schoolIds = (await database.db.select({ id: schools.id }).from(schools)).map(
    (row) => row.id,
  );
  const demoStudents = 1_670;
  if (students > demoStudents)
    await loadBenchStudents(database.pglite!, schoolIds, students - demoStudents);
  const capture = async (work: () => Promise<unknown>) => {
    captured.length = 0;
    capturing = true;
    await work();
    capturing = false;
    return captured.filter((statement) => !backgroundStatement.test(statement.query));
  };
  return { database, schoolIds, capture };
}

/**
 * The per-token limit the benchmark's server runs with. The load's clients share one token, and
 * the production default (RATE_LIMIT_TOKEN, 1,200 a minute) is a guard against a runaway
 * script, not a capacity: a machine that answers pages faster than 20 a second would trip it and
 * stop the run with 429s. The limiter still counts every request, as it does in production.
 */
export const benchTokenLimit = 100_000_000;

/** The production default of RATE_LIMIT_TOKEN, which the smoke run's load goes past. */
export const defaultTokenLimit = loadConfig({}).rateLimits.token;

/** Serves the app for a database on a loopback port; answers its URL and a coordinator token. */
export async function serveForBench(database: DatabaseHandle, dataDir = '/tmp/tutti-bench-unused') {
  const config = loadConfig({
    LOG_LEVEL: 'silent',
    TUTTI_DATA_DIR: dataDir,
    OIDC_ISSUER: 'http://127.0.0.1:9',
    RATE_LIMIT_TOKEN: String(benchTokenLimit),
  });
  const app = await createApp(config, {
    database,
    logger: createLogger('silent'),
    serveWeb: false,
  });
  const server = createHttpServer(app);
  let answered = 0;
  server.on('request', (_request, response: import('node:http').ServerResponse) =>
    response.on('finish', () => (answered += 1)),
  );
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const [coordinator] = await database.db.select().from(users).where(eq(users.role, 'coordinator'));
  const { token } = await issueToken(database.db, coordinator!.id, 'bench');
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const get = async (path: string) => {
    const response = await fetch(`${url}${path}`, {
      headers: { authorization: `Bearer ${token}` },
    });
    if (!response.ok)
      throw new Error(`${path} answered ${response.status}: ${await response.text()}`);
    return response.json();
  };
  return {
    url,
    token,
    get,
    /** Requests the server has answered so far, every status. */
    requestsAnswered: async () => answered,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/**
 * A pause between one side's round and the other's, in which the event loop runs what is
 * pending. The direct replay only awaits the engine, so the event loop never turns inside a
 * round and the young-generation collections its garbage calls for (V8 runs them as tasks)
 * wait for the round to end; without the pause they ran as the next HTTP round began and were
 * charged to the product. Each side still pays, inside its round, for the collections its own
 * allocations bring on.
 */
const settle = () => new Promise<void>((resolve) => setTimeout(resolve, 20));

/** The grid pages a director or coordinator opens most. */
export function gridPages(
  schoolId: number,
  total: number,
): { name: string; path: string; indexedSort: boolean }[] {
  return [
    { name: 'students: default order', path: '/api/students?limit=100', indexedSort: true },
    {
      name: 'students: sort by grade',
      path: '/api/students?sort=grade:desc&limit=100',
      indexedSort: true,
    },
    {
      name: 'students: filter by school',
      path: `/api/students?schoolId=${schoolId}&limit=100`,
      indexedSort: true,
    },
    { name: 'students: text search', path: '/api/students?q=okaf&limit=100', indexedSort: false },
    {
      name: 'students: deep page',
      path: `/api/students?offset=${Math.max(0, total - 2_000)}&limit=100`,
      indexedSort: true,
    },
    {
      name: 'students: middle page by offset',
      path: `/api/students?offset=${Math.floor(total / 2)}&limit=100`,
      indexedSort: true,
    },
    { name: 'schools: list with counts', path: '/api/schools?limit=100', indexedSort: false },
  ];
}

/**
 * 100-row pages through HTTP with a bearer token (the client on a worker thread), against the
 * same SQL (captured from the route) run directly on the database in the same process. Target: p95 within the direct p95
 * + 10 ms, and under 25 ms for indexed sorts.
 */
export async function benchGridPages(options: {
  students: number;
  runs?: number;
}): Promise<BenchFigure[]> {
  const runs = options.runs ?? 30;
  const district = await benchDistrict(options.students);
  const server = await serveForBench(district.database);
  const clients = httpClients(server.url, server.token);
  const figures: BenchFigure[] = [];
  try {
    // The page after the middle one, as a grid scrolling down asks for it: by the cursor the
    // middle page's answer gave (its Link header).
    const middle = await fetch(
      `${server.url}/api/students?offset=${Math.floor(options.students / 2) - 100}&limit=100`,
      {
        headers: { authorization: `Bearer ${server.token}` },
      },
    );
    const cursorPath = /^<([^>]+)>; rel="next"$/.exec(middle.headers.get('link') ?? '')?.[1];
    if (!cursorPath) throw new Error('The middle page answered no next-page link.');
    const pages = [
      ...gridPages(district.schoolIds[0]!, options.students),
      { name: 'students: middle page by cursor', path: cursorPath, indexedSort: true },
    ];
    for (const page of pages) {
      // Once before capturing: a token's first use notes it (then at most once a minute), a
      // write the pages that follow do not make.
      await server.get(page.path);
      const statements = await district.capture(() => server.get(page.path));
      const runDirect = async () => {
        for (const statement of statements)
          await district.database.pglite!.query(statement.query, statement.params as never[]);
      };
      // A few rounds of both first, so the timings are of compiled code and planned queries.
      for (let round = 0; round < 5; round += 1) {
        await clients.sequential(page.path, 1);
        await runDirect();
      }
      // Then both in alternating rounds of ten, so a burst of noise on a shared machine lands
      // on both sides rather than on whichever ran through it.
      const productTimes: number[] = [];
      const directTimes: number[] = [];
      for (let done = 0; done < runs; done += 10) {
        const size = Math.min(10, runs - done);
        productTimes.push(...(await clients.sequential(page.path, size)));
        await settle();
        directTimes.push(...(await timings(runDirect, size, 0)));
        await settle();
      }
      const product = percentile(productTimes, 95);
      const direct = percentile(directTimes, 95);
      const target = page.indexedSort ? 'p95 ≤ direct + 10 ms and < 25 ms' : 'p95 ≤ direct + 10 ms';
      const met = product <= direct + 10 && (!page.indexedSort || product < 25);
      figures.push(
        figure(
          `${page.name} (p95, ${options.students.toLocaleString('en-US')} students)`,
          product,
          direct,
          `${target}: ${met ? 'met' : 'NOT met'}`,
        ),
      );
    }
  } finally {
    await clients.close();
    await server.close();
    await district.database.close();
  }
  return figures;
}
