import fc from 'fast-check';
import request from 'supertest';
import { sql } from 'drizzle-orm';
import type { Router } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { featureRoutes } from '../../server/app';
import { rowsOf } from '../../server/db/client';
import { createLogger } from '../../server/logger';
import type { Services } from '../../server/services';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

let app: TestApp;
let token: string;
beforeAll(async () => {
  // The fuzz sends a few thousand requests with one token; the per-token limit is not under test.
  app = await startTestApp({ environment: { RATE_LIMIT_TOKEN: '1000000' } });
  token = await app.token(demoEmail('coordinator'));
});
afterAll(() => app?.close());

interface Route {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string;
}

/** Every API route the app mounts, read from the feature routers themselves. */
function apiRoutes(): Route[] {
  const services = {
    config: app.config,
    db: app.database.db,
    database: app.database,
    logger: createLogger('silent'),
  } as Services;
  const routes: Route[] = [];
  for (const build of featureRoutes) {
    const router = build(services) as Router & {
      stack: { route?: { path: string; methods: Record<string, boolean> } }[];
    };
    for (const layer of router.stack) {
      if (!layer.route) continue;
      for (const method of Object.keys(layer.route.methods)) {
        routes.push({ method: method as Route['method'], path: `/api${layer.route.path}` });
      }
    }
  }
  return routes;
}

// PostgreSQL 18 documentation §8.1.1: integer holds -2147483648 to +2147483647.
const tooLargeIds = fc.oneof(
  fc.constant(2 ** 31),
  fc.integer({ min: 2 ** 31, max: Number.MAX_SAFE_INTEGER }),
  fc.constant(1e20),
);
// ISO 8601 years 0000 and beyond 9999 (an expanded representation) are outside PostgreSQL's
// usual range for our columns or simply not dates anyone keeps.
const outOfRangeDates = fc.constantFrom(
  '0000-01-01',
  '0001-01-01',
  '9999-12-31',
  '1899-12-31',
  '2026-02-30',
);
// NUL cannot be stored in PostgreSQL text (§8.3); the other C0 controls are invisible.
const controlText = fc
  .tuple(
    fc.string({ maxLength: 8 }),
    fc.constantFrom('\u0000', '\u0001', '\u001b', '\u007f'),
    fc.string({ maxLength: 8 }),
  )
  .map(([before, control, after]) => `${before}${control}${after}`);
const poison = fc.oneof(tooLargeIds, outOfRangeDates, controlText);

/** Field names the API uses, so poison lands on fields the routes read, and some they do not. */
const knownFields = [
  'id',
  'studentId',
  'schoolId',
  'ensembleId',
  'instrumentId',
  'schoolYearId',
  'toSchoolId',
  'directorUserId',
  'userId',
  'loanId',
  'repairId',
  'ladderVersionId',
  'version',
  'heardOn',
  'from',
  'to',
  'asOf',
  'dueOn',
  'sentOn',
  'returnedOn',
  'purchasedOn',
  'checkedOutOn',
  'note',
  'name',
  'label',
  'title',
  'problem',
  'vendor',
  'assetTag',
  'serial',
  'maker',
  'model',
  'firstName',
  'lastName',
  'studentNumber',
  'code',
  'q',
  'requirementCode',
  'part',
  'email',
];
const plausible = fc.oneof(
  fc.constant(1),
  fc.constant('2026-03-02'),
  fc.constant('x'),
  fc.boolean(),
);
const field = fc.oneof(fc.constantFrom(...knownFields), fc.constant('unexpectedField'));

/** A body or filter set holding at least one value no route may accept. */
const badFields = fc
  .tuple(fc.dictionary(field, plausible, { maxKeys: 3 }), field, poison)
  .map(([others, name, value]) => ({ ...others, [name]: value }));

const badPathIds = fc.constantFrom('2147483648', '99999999999999999999', '0', '-1', '1.5');

/** A fingerprint of every table: its row count and the newest transaction that wrote a row. */
async function fingerprint(): Promise<Record<string, string>> {
  const tables = rowsOf<{ name: string }>(
    await app.database.db.execute(
      sql`select tablename as name from pg_tables where schemaname = 'public' order by tablename`,
    ),
  ).map((row) => row.name);
  const result: Record<string, string> = {};
  // A token's last use is noted once a minute, and sessions are kept per browser: neither is a write the request asked for.
  for (const table of tables.filter((name) => !['api_tokens', 'sessions'].includes(name))) {
    const [row] = rowsOf<{ total: number; newest: string | null }>(
      await app.database.db.execute(
        sql.raw(
          `select count(*)::int as total, max(xmin::text::bigint)::text as newest from "${table}"`,
        ),
      ),
    );
    result[table] = `${row!.total}:${row!.newest}`;
  }
  return result;
}

function fill(path: string, id: string): string {
  return path.replace(/:(\w+)/g, (_match, name: string) =>
    name === 'grid' ? 'students' : name === 'token' ? 'x' : id,
  );
}

describe('Bad input on every route', () => {
  it('should answer 4xx, never 5xx, and write nothing for out-of-range ids, year-0 dates and control characters', async () => {
    const routes = apiRoutes();
    expect(routes.length).toBeGreaterThan(80);
    const before = await fingerprint();
    const failures: string[] = [];
    const send = (method: Route['method'], target: string, body?: object) => {
      const pending = request(app.url)[method](target).set('Authorization', `Bearer ${token}`);
      return body === undefined ? pending : pending.send(body);
    };
    const note = (method: string, target: string, body: unknown, response: request.Response) =>
      failures.push(
        `${method.toUpperCase()} ${target} ${JSON.stringify(body) ?? ''} → ${response.status} ${(response.text ?? '').slice(0, 160)}`,
      );
    for (const route of routes) {
      const hasParameters = /:(?!grid\b|token\b)\w+/.test(route.path);
      // Filters: a poisoned value or an unknown parameter on every read.
      if (route.method === 'get') {
        await fc.assert(
          fc.asyncProperty(badFields, async (fields) => {
            const query = new URLSearchParams(
              Object.entries(fields).map(([name, value]) => [name, String(value)]),
            );
            const target = `${fill(route.path, '1')}?${query}`;
            const response = await send('get', target);
            if (response.status >= 500 || (response.status < 400 && !hasParameters))
              note('get', target, undefined, response);
          }),
          { numRuns: 4, seed: 23 },
        );
      }
      // Ids in the address beyond what the database holds, or not ids at all.
      if (hasParameters) {
        await fc.assert(
          fc.asyncProperty(badPathIds, async (id) => {
            const target = fill(route.path, id);
            const response = await send(
              route.method,
              target,
              route.method === 'get' || route.method === 'delete' ? undefined : {},
            );
            if (response.status >= 500 || response.status < 400)
              note(route.method, target, undefined, response);
          }),
          { numRuns: 3, seed: 23 },
        );
      }
      // Bodies with a poisoned field on every write.
      if (route.method !== 'get' && route.method !== 'delete') {
        await fc.assert(
          fc.asyncProperty(badFields, async (body) => {
            const target = fill(route.path, '1');
            const response = await send(route.method, target, body);
            if (response.status >= 500 || response.status < 400)
              note(route.method, target, body, response);
          }),
          { numRuns: 8, seed: 23 },
        );
      }
    }
    expect(failures).toEqual([]);
    expect(await fingerprint()).toEqual(before);
  }, 300_000);
});
