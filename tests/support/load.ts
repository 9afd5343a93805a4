import { createRequire } from 'node:module';

/** One request a load connection sends. */
export interface LoadRequest {
  method: 'GET' | 'POST';
  path: string;
  headers: Record<string, string>;
  body?: string;
}

/** One kind of request in a load run, sent by its own connections. */
export interface LoadLane {
  kind: string;
  connections: number;
  /** The next request of one connection; `sequence` counts that connection's requests. */
  next(connection: number, sequence: number): LoadRequest;
  /** Sees every answer, with the request it answers. */
  onResponse?(status: number, body: string, request: LoadRequest): void;
  /**
   * How many requests the lane sends in all. Every one is awaited, so no request is dropped
   * unanswered at the end of the run.
   */
  amount: number;
}

/** What one lane's connections got back. */
export interface LaneResult {
  kind: string;
  requests: number;
  /** Answers by HTTP status, e.g. `{ 200: 812 }`. */
  statuses: Record<string, number>;
  non2xx: number;
  /** Connection errors, timeouts included. */
  errors: number;
  timeouts: number;
  /** Milliseconds. */
  latency: { p50: number; p90: number; p99: number; max: number };
}

interface AutocannonHistogram {
  p50: number;
  p90: number;
  p99: number;
  max: number;
}

interface AutocannonResult {
  latency: AutocannonHistogram;
  errors: number;
  timeouts: number;
  non2xx: number;
  statusCodeStats: Record<string, { count: number }>;
}

interface AutocannonRequest {
  method?: string;
  path?: string;
  headers?: Record<string, string>;
  body?: string;
  setupRequest?(request: AutocannonRequest, context: Record<string, unknown>): AutocannonRequest;
  onResponse?(status: number, body: string, context: Record<string, unknown>): void;
}

interface AutocannonClient {
  setRequests(requests: AutocannonRequest[]): void;
}

type Autocannon = (options: Record<string, unknown>) => Promise<AutocannonResult>;

// autocannon ships CommonJS without type declarations; these are the parts of its documented
// programmatic API (README, "API") that the load test uses.
const autocannon = createRequire(import.meta.url)('autocannon') as Autocannon;

/** How hard each connection pushes, and when an answer counts as never coming. */
export interface LoadOptions {
  /** An answer slower than this counts as a timeout (a hang, not a slow page). */
  timeoutSeconds: number;
  /** Requests a second each connection sends at most: one user's pace. */
  connectionRate: number;
}

/**
 * Runs every lane at once against `url` with autocannon, each lane on its own connections, until
 * each lane has its `amount` of answers; answers each lane's counts and latencies.
 */
export async function runLoad(
  url: string,
  lanes: LoadLane[],
  options: LoadOptions,
): Promise<LaneResult[]> {
  return Promise.all(
    lanes.map(async (lane) => {
      let connections = 0;
      const result = await autocannon({
        url,
        connections: lane.connections,
        timeout: options.timeoutSeconds,
        connectionRate: options.connectionRate,
        // Latency is each answer's own time; autocannon's correction for a fixed send rate would
        // count the paced gaps between one user's requests as waiting.
        ignoreCoordinatedOmission: true,
        amount: lane.amount,
        setupClient(client: AutocannonClient) {
          const connection = connections++;
          let sequence = 0;
          client.setRequests([
            {
              setupRequest(request, context) {
                const next = lane.next(connection, sequence++);
                context['sent'] = next;
                return { ...request, ...next, headers: { ...request.headers, ...next.headers } };
              },
              onResponse(status, body, context) {
                lane.onResponse?.(status, body, context['sent'] as LoadRequest);
              },
            },
          ]);
        },
      });
      const statuses = Object.fromEntries(
        Object.entries(result.statusCodeStats).map(([status, { count }]) => [
          status,
          Number(count),
        ]),
      );
      return {
        kind: lane.kind,
        requests: Object.values(statuses).reduce((sum, count) => sum + count, 0),
        statuses,
        non2xx: result.non2xx,
        errors: result.errors,
        timeouts: result.timeouts,
        latency: {
          p50: result.latency.p50,
          p90: result.latency.p90,
          p99: result.latency.p99,
          max: result.latency.max,
        },
      };
    }),
  );
}

/** The lanes' latencies as a fixed-width table, for the test log. */
export function latencyTable(results: LaneResult[]): string {
  const header = ['kind', 'requests', 'p50 ms', 'p90 ms', 'p99 ms', 'max ms'];
  const rows = results.map((result) => [
    result.kind,
    String(result.requests),
    ...[result.latency.p50, result.latency.p90, result.latency.p99, result.latency.max].map(
      (value) => value.toFixed(1),
    ),
  ]);
  const widths = header.map((title, column) =>
    Math.max(title.length, ...rows.map((row) => row[column]!.length)),
  );
  return [header, ...rows]
    .map((row) => row.map((cell, column) => cell.padEnd(widths[column]!)).join('  '))
    .join('\n');
}
