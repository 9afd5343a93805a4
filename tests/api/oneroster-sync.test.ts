import request from 'supertest';
import { sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { runSync } from '../../server/oneroster/sync-service';
import {
  allButCoordinator,
  expectCoordinatorOnly,
  useTestApp,
  type SignedInClient,
} from '../support/test-app';

function putSettings(client: SignedInClient, body: object) {
  return request(app.url)
    .put('/api/oneroster/sync')
    .set({ Cookie: client.cookie, Origin: app.url })
    .send(body);
}

function settings(overrides: object = {}) {
  return {
    baseUrl: app.oneRoster.url,
    apiVersion: '1.2',
    tokenUrl: app.oneRoster.tokenUrl,
    clientId: app.oneRoster.clientId,
    clientSecret: app.oneRoster.clientSecret,
    enabled: false,
    runAt: '02:30',
    ...overrides,
  };
}

async function roster(...numbers: string[]) {
  return rowsOf<{ student_number: string; first_name: string; status: string; code: string }>(
    await app.database.db.execute(sql`
      select s.student_number, s.first_name, s.status, sc.code
      from students s join schools sc on sc.id = s.school_id
      where s.student_number = any(${sql.param(numbers)}::text[])
      order by s.student_number collate "C"`),
  );
}

async function studentTotal(): Promise<number> {
  const [row] = rowsOf<{ total: number }>(
    await app.database.db.execute(sql`select count(*)::int as total from students`),
  );
  return row!.total;
}

const app = useTestApp({ signIn: ['coordinator', ...allButCoordinator] }, 120_000);
const { coordinator } = app.clients;

describe('OneRoster REST sync', () => {
  it('should answer 403 to the sync routes when the role is not coordinator', async () => {
    await expectCoordinatorOnly(app, (client) => [
      client.get('/api/oneroster/sync'),
      putSettings(client, settings()),
      client.post('/api/oneroster/sync/run', {}),
    ]);
  });

  it('should keep the client secret encrypted and never answer it', async () => {
    const noSecret = await putSettings(coordinator, settings({ clientSecret: undefined }));
    expect(noSecret.status).toBe(400);
    const badUrl = await putSettings(coordinator, settings({ baseUrl: 'ftp://example' }));
    expect(badUrl.status).toBe(400);
    const saved = await putSettings(coordinator, settings());
    expect(saved.status).toBe(200);
    expect(saved.body).toMatchObject({ configured: true, hasSecret: true, runAt: '02:30' });
    const read = await coordinator.get('/api/oneroster/sync');
    for (const answer of [saved.text, read.text])
      expect(answer).not.toContain(app.oneRoster.clientSecret);
    const [row] = rowsOf<{ client_secret_encrypted: string }>(
      await app.database.db.execute(sql`select client_secret_encrypted from oneroster_sync`),
    );
    expect(row!.client_secret_encrypted).not.toContain(app.oneRoster.clientSecret);
    const audit = rowsOf<{ after: unknown }>(
      await app.database.db.execute(
        sql`select after from audit_log where entity = 'oneroster_sync'`,
      ),
    );
    expect(JSON.stringify(audit)).not.toContain(app.oneRoster.clientSecret);
  });

  it('should import the provider’s roster, then only its changes, when run twice with a change between', async () => {
    const first = await coordinator.post('/api/oneroster/sync/run', {});
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({
      rows: 5,
      created: 5,
      withdrawn: 0,
      errors: [],
      committed: true,
      failure: null,
    });
    expect(await roster('or.talia.brenn', 'or.jonah.vesk', 'or.sol.adair')).toEqual([
      { student_number: 'or.jonah.vesk', first_name: 'Jonah', status: 'active', code: 'HPMS' },
      { student_number: 'or.sol.adair', first_name: 'Sol', status: 'active', code: 'FBES' },
      { student_number: 'or.talia.brenn', first_name: 'Talia', status: 'active', code: 'HPMS' },
    ]);

    // Changes made on the provider: a new name, a student gone, a new student in a class.
    app.oneRoster.touch('users', 'u-101', { givenName: 'Tali' });
    app.oneRoster.touch('users', 'u-102', { status: 'tobedeleted' });
    app.oneRoster.add('users', {
      ...app.oneRoster.roster.users[0]!,
      sourcedId: 'u-106',
      identifier: 'or.noor.ekwa',
      username: 'or.noor.ekwa',
      givenName: 'Noor',
      familyName: 'Ekwa',
      grades: ['06'],
    });
    app.oneRoster.add('enrollments', {
      ...app.oneRoster.roster.enrollments[0]!,
      sourcedId: 'e-6',
      user: { sourcedId: 'u-106', type: 'user' },
    });
    const before = app.oneRoster.requests().length;
    const second = await coordinator.post('/api/oneroster/sync/run', {});
    expect(second.body).toMatchObject({
      created: 1,
      updated: 1,
      withdrawn: 1,
      errors: [],
      committed: true,
    });
    // 1EdTech OneRoster REST binding: changes are asked for with a dateLastModified filter.
    const asked = app.oneRoster.requests().slice(before);
    expect(
      asked.some(
        (line) =>
          line.startsWith('/ims/oneroster/rostering/v1p2/users?') &&
          line.includes('filter=dateLastModified'),
      ),
    ).toBe(true);
    expect(
      await roster('or.talia.brenn', 'or.jonah.vesk', 'or.noor.ekwa', 'or.priya.lund'),
    ).toEqual([
      { student_number: 'or.jonah.vesk', first_name: 'Jonah', status: 'withdrawn', code: 'HPMS' },
      { student_number: 'or.noor.ekwa', first_name: 'Noor', status: 'active', code: 'HPMS' },
      { student_number: 'or.priya.lund', first_name: 'Priya', status: 'active', code: 'QHMS' },
      { student_number: 'or.talia.brenn', first_name: 'Tali', status: 'active', code: 'HPMS' },
    ]);
    const history = await coordinator.get('/api/imports');
    expect(
      history.body.rows.filter((row: { fileName: string }) =>
        row.fileName.startsWith('OneRoster REST sync'),
      ),
    ).toHaveLength(2);
    const third = await coordinator.post('/api/oneroster/sync/run', {});
    expect(third.body).toMatchObject({ rows: 0, committed: false, failure: null });
    expect((await coordinator.get('/api/oneroster/sync')).body.lastOutcome).toBe('no changes');
  });

  it('should make the students a delta withdrew active again, with their seats, when the sync is undone', async () => {
    const history = await coordinator.get('/api/imports?sort=createdAt:desc&limit=5');
    const delta = (
      history.body.rows as { id: number; fileName: string; committed: boolean }[]
    ).find((row) => row.committed && row.fileName.startsWith('OneRoster REST sync'))!;
    const seats = async () =>
      rowsOf<{ active: boolean }>(
        await app.database.db.execute(sql`
          select en.active from enrollments en join students s on s.id = en.student_id
          where s.student_number = 'or.jonah.vesk'`),
      );
    expect(await seats()).toEqual([{ active: false }]);
    const preview = await coordinator.get(`/api/imports/${delta.id}/undo`);
    expect(preview.body).toMatchObject({ withdrawalsReversed: 1, canUndo: true });
    const undone = await coordinator.post(`/api/imports/${delta.id}/undo`, {});
    expect(undone.status).toBe(200);
    expect(await roster('or.jonah.vesk')).toEqual([
      { student_number: 'or.jonah.vesk', first_name: 'Jonah', status: 'active', code: 'HPMS' },
    ]);
    expect(await seats()).toEqual([{ active: true }]);
  });

  it.each([
    ['unavailable', 'The provider answered 503 for orgs.'],
    ['not-json', "The provider's orgs page answered with something that is not a JSON object."],
    ['unauthorized', 'The provider refused the access token (401) for orgs.'],
  ] as const)(
    'should record a failed run and write nothing when the provider is %s',
    async (kind, reason) => {
      const total = await studentTotal();
      app.oneRoster.trouble(kind);
      const run = await coordinator.post('/api/oneroster/sync/run', {});
      expect(run.status).toBe(200);
      expect(run.body).toMatchObject({ committed: false, failure: reason });
      expect(await studentTotal()).toBe(total);
      const state = (await coordinator.get('/api/oneroster/sync')).body;
      expect(state).toMatchObject({ lastOutcome: 'failed', lastError: reason });
    },
  );

  it('should record a failed run when a page times out', async () => {
    app.oneRoster.trouble('slow');
    const run = await runSync(
      app.database,
      app.config,
      { dryRun: false, skipInvalid: false, actor: null, via: 'api' },
      500,
    );
    expect(run.failure).toBe("The provider's orgs page did not answer within 1 s.");
    expect(run.result.committed).toBe(false);
  });

  it('should say the client is refused, without the secret, when the secret is wrong', async () => {
    const current = (await coordinator.get('/api/oneroster/sync')).body;
    const saved = await putSettings(
      coordinator,
      settings({ clientSecret: 'not-the-secret-0000', version: current.version }),
    );
    expect(saved.status).toBe(200);
    const run = await coordinator.post('/api/oneroster/sync/run', {});
    expect(run.body.failure).toBe(
      'The token endpoint refused the client (401); check the client id and secret.',
    );
    expect(run.text).not.toContain('not-the-secret-0000');
    const unreachable = await putSettings(
      coordinator,
      settings({ tokenUrl: 'http://127.0.0.1:9/oauth/token', version: saved.body.version }),
    );
    expect(unreachable.status).toBe(200);
    const down = await coordinator.post('/api/oneroster/sync/run', {});
    expect(down.body.failure).toMatch(/^The token endpoint could not be reached/);
  });
});
