import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { rowsOf } from '../../server/db/client';
import { importRoster, type ImportOutcome } from '../../server/imports/imports-service';
import { studentSortFields } from '@shared/api/student';
import { ensembleSortFields } from '@shared/api/ensemble';
import { instrumentSortFields } from '@shared/api/instrument';
import { toRosterCsv } from '@shared/roster';
import { inventedRoster } from '../bench/roster-import';
import { latencyTable, runLoad, type LoadLane, type LoadRequest } from '../support/load';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

let app: TestApp;
beforeAll(async () => {
  app = await startTestApp();
}, 120_000);
afterAll(() => app?.close());

/** The headers one signed-in user sends: a session cookie (with its Origin) or an API token. */
type Credentials = Record<string, string>;

/**
 * One credential per connection, cycling through the users: each token connection gets a token
 * of its own (the API limits requests per token per minute), and every third connection uses one
 * of the users' browser sessions instead.
 */
async function credentialsFor(
  users: string[],
  connections: number,
  sessions: Map<string, Credentials>,
): Promise<Credentials[]> {
  return Promise.all(
    Array.from({ length: connections }, async (_, connection) => {
      const user = users[connection % users.length]!;
      const session = sessions.get(user);
      if (session && connection % 3 === 2) return session;
      return { Authorization: `Bearer ${await app.token(demoEmail(user))}` };
    }),
  );
}

/** Cycles through a lane's valid list pages; `variant` spreads connections over them. */
function pick<Item>(items: readonly Item[], variant: number): Item {
  return items[variant % items.length]!;
}

const rosterReaders = [
  'coordinator',
  'director.hpms',
  'director.qhms',
  'director.trhs',
  'director.fbes',
  'viewer.trhs',
  'director.omms',
];
const fleetReaders = ['coordinator', 'technician', 'director.hpms', 'director.qhms', 'viewer.trhs'];
const schoolReaders = ['coordinator', 'technician', 'director.trhs', 'viewer.trhs'];

describe('Load', () => {
  it('should answer 50 signed-in users on grid pages and pass-off writes during an import with no errors and no lost writes', async () => {
    const sessionUsers = ['coordinator', 'director.hpms', 'director.qhms', 'viewer.trhs'];
    const sessions = new Map<string, Credentials>();
    for (const user of sessionUsers) {
      const client = await app.signIn(demoEmail(user));
      sessions.set(user, { Cookie: client.cookie, Origin: app.url });
    }
    const hpmsStudents = rowsOf<{ id: number }>(
      await app.database.db
        .execute(sql`select s.id from students s join schools sc on sc.id = s.school_id
        where sc.code = 'HPMS' and s.status = 'active' order by s.id limit 60`),
    ).map((row) => row.id);
    const ladder = await app.bearer(await app.token(demoEmail('director.hpms'))).get('/api/ladder');
    expect(ladder.status).toBe(200);
    const requirements = (
      ladder.body.rungs as { requirements: { code: string; tempo: number }[] }[]
    ).flatMap((rung) => rung.requirements);
    expect(hpmsStudents.length).toBeGreaterThan(20);
    expect(requirements.length).toBeGreaterThan(3);

    const [studentUsers, ensembleUsers, instrumentUsers, schoolUsers, passOffUsers] =
      await Promise.all([
        credentialsFor(rosterReaders, 20, sessions),
        credentialsFor(rosterReaders, 8, sessions),
        credentialsFor(fleetReaders, 8, sessions),
        credentialsFor(schoolReaders, 4, sessions),
        credentialsFor(['director.hpms'], 10, sessions),
      ]);

    const studentPages = [
      ...studentSortFields.flatMap((field) => [`sort=${field}:asc`, `sort=${field}:desc`]),
      'q=ma',
      'q=s',
      'q=ro&sort=grade:desc',
      'grade=6',
      'grade=8&sort=firstName:asc',
      'status=active&offset=50',
      'status=withdrawn',
      'offset=100&limit=50',
      'offset=200&limit=25',
      'instrumentId=trumpet',
      'instrumentId=flute&offset=10',
    ];
    const ensemblePages = [
      ...ensembleSortFields.flatMap((field) => [`sort=${field}:asc`, `sort=${field}:desc`]),
      'q=band',
      'q=or',
      'offset=10&limit=10',
    ];
    const instrumentPages = [
      ...instrumentSortFields.flatMap((field) => [`sort=${field}:asc`, `sort=${field}:desc`]),
      'q=tu',
      'offset=50&limit=50',
    ];
    const schoolPages = [
      'sort=name:asc',
      'sort=code:desc',
      'sort=studentCount:desc',
      'sort=ensembleCount:asc',
      'q=he',
      'level=middle',
    ];

    // At one request a second per user, the run lasts about this many seconds on a quiet machine.
    const requestsPerUser = 12;
    const unexpected: string[] = [];
    const note = (kind: string) => (status: number, body: string, request: LoadRequest) => {
      if (status < 200 || status >= 300)
        unexpected.push(
          `${kind} ${request.method} ${request.path} → ${status} ${body.slice(0, 200)}`,
        );
    };
    const getLane = (
      kind: string,
      resource: string,
      users: Credentials[],
      pages: string[],
    ): LoadLane => ({
      kind,
      connections: users.length,
      amount: users.length * requestsPerUser,
      next: (connection, sequence) => ({
        method: 'GET',
        path: `/api/${resource}?${pick(pages, connection * 7 + sequence)}`,
        headers: users[connection]!,
      }),
      onResponse: note(kind),
    });

    const sentKeys = new Set<string>();
    const acknowledged = new Set<string>();
    const heardOn = new Date().toISOString().slice(0, 10);
    const passOffLane: LoadLane = {
      kind: 'POST /api/pass-offs',
      connections: passOffUsers.length,
      amount: passOffUsers.length * requestsPerUser,
      next: (connection, sequence) => {
        const requirement = pick(requirements, connection + sequence);
        const clientKey = randomUUID();
        sentKeys.add(clientKey);
        return {
          method: 'POST',
          path: '/api/pass-offs',
          headers: { ...passOffUsers[connection]!, 'Content-Type': 'application/json' },
          body: JSON.stringify({
            studentId: pick(hpmsStudents, connection * 13 + sequence),
            requirementCode: requirement.code,
            heardOn,
            tempo: requirement.tempo,
            passed: sequence % 4 !== 0,
            note: 'Heard during the load test.',
            clientKey,
          }),
        };
      },
      onResponse(status, body, request) {
        note('POST /api/pass-offs')(status, body, request);
        const sent = (JSON.parse(request.body!) as { clientKey: string }).clientKey;
        if (status >= 200 && status < 300) {
          const answered = (JSON.parse(body) as { clientKey: string | null }).clientKey;
          if (answered !== sent) unexpected.push(`pass-off ${sent} answered as ${answered}`);
          acknowledged.add(sent);
        }
      },
    };

    const rows = inventedRoster(2_000, 23, 820_000);
    const importedNumbers = [...new Set(rows.map((row) => row.studentId))];
    const bytes = new TextEncoder().encode(toRosterCsv(rows));
    let outcome: ImportOutcome | undefined;
    const started = performance.now();
    let importMs = 0;
    const importDuringLoad = (async () => {
      await new Promise((resolve) => setTimeout(resolve, 2_000));
      const importStarted = performance.now();
      outcome = await importRoster(
        app.database,
        {
          upload: { fileName: 'load-test.csv', bytes },
          withdrawMissing: false,
          skipInvalid: false,
        },
        null,
        { fileName: 'load-test.csv', via: 'cli' },
      );
      importMs = performance.now() - importStarted;
    })();

    const lanes = [
      getLane('GET /api/students', 'students', studentUsers, studentPages),
      getLane('GET /api/ensembles', 'ensembles', ensembleUsers, ensemblePages),
      getLane('GET /api/instruments', 'instruments', instrumentUsers, instrumentPages),
      getLane('GET /api/schools', 'schools', schoolUsers, schoolPages),
      passOffLane,
    ];
    const connectionsOf = Object.fromEntries(lanes.map((lane) => [lane.kind, lane.connections]));
    expect(lanes.reduce((sum, lane) => sum + lane.connections, 0)).toBe(50);
    const [results] = await Promise.all([
      runLoad(
        app.url,
        lanes,
        // A user sends at most one request a second. On two shared cores a page can wait tens of
        // seconds behind the others; an answer that takes two minutes is a hang.
        { connectionRate: 1, timeoutSeconds: 120 },
      ),
      importDuringLoad,
    ]);
    const totalMs = performance.now() - started;

    console.log(
      `Load: 50 users for ${(totalMs / 1000).toFixed(1)} s; a ${rows.length.toLocaleString('en-US')}-row import ran ${Math.round(importMs)} ms of it.\n${latencyTable(results)}`,
    );

    expect(unexpected.slice(0, 10), unexpected.slice(0, 10).join('\n')).toEqual([]);
    for (const result of results) {
      // Each lane sends its full amount, every request answered.
      expect(result.requests, result.kind).toBe(connectionsOf[result.kind]! * requestsPerUser);
      expect({
        kind: result.kind,
        errors: result.errors,
        timeouts: result.timeouts,
        non2xx: result.non2xx,
      }).toEqual({
        kind: result.kind,
        errors: 0,
        timeouts: 0,
        non2xx: 0,
      });
    }

    // Every acknowledged pass-off is stored once, and nothing unacknowledged was stored.
    expect(acknowledged.size).toBe(passOffLane.amount);
    const stored = rowsOf<{ client_key: string }>(
      await app.database.db.execute(
        sql`select client_key::text as client_key from pass_offs where client_key::text = any(${`{${[...sentKeys].join(',')}}`}::text[])`,
      ),
    ).map((row) => row.client_key);
    expect(stored.length).toBe(acknowledged.size);
    expect(new Set(stored)).toEqual(acknowledged);

    // The import committed, and every one of its students is on the roster.
    expect(outcome?.result.committed, JSON.stringify(outcome?.result.errors.slice(0, 3))).toBe(
      true,
    );
    // Counted by roster row: every row of the file was new.
    expect(outcome?.result.created).toBe(rows.length);
    const [imported] = rowsOf<{ total: number }>(
      await app.database.db.execute(
        sql`select count(*)::int as total from students where student_number = any(${`{${importedNumbers.join(',')}}`}::text[])`,
      ),
    );
    expect(imported!.total).toBe(importedNumbers.length);
  }, 420_000);
});
