import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

// Only a PostgreSQL server has connections an administrator can end; CI runs this file there.
describe.runIf(process.env['TEST_DATABASE_URL'])('On a PostgreSQL server', () => {
  let app: TestApp;
  beforeAll(async () => {
    app = await startTestApp();
  });
  afterAll(async () => {
    await app?.close();
  });

  // PostgreSQL documentation, "Server Signaling Functions": pg_terminate_backend ends a session,
  // as a restart or failover does; node-postgres then emits 'error' on the pool.
  it('should keep answering when the server ends its pooled connections', async () => {
    const director = app.bearer(await app.token(demoEmail('director.hpms')));
    expect((await director.get('/api/students?limit=5')).status).toBe(200);
    const database = (await app.database.pool!.query('select current_database() as name')).rows[0]
      .name as string;
    const admin = new pg.Client({ connectionString: process.env['TEST_DATABASE_URL'] });
    await admin.connect();
    try {
      const ended = await admin.query(
        'select count(*)::int as count from (select pg_terminate_backend(pid) from pg_stat_activity where datname = $1) ended',
        [database],
      );
      expect(ended.rows[0].count).toBeGreaterThan(0);
    } finally {
      await admin.end();
    }
    // The pool drops the dead clients and opens new ones for the next requests.
    await expect
      .poll(async () => (await director.get('/api/students?limit=5')).status, { timeout: 10_000 })
      .toBe(200);
  });
});
