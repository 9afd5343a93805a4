import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { eq, inArray, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createHttpServer } from '../../server/core/http-server';
import { openDatabase, rowsOf, type DatabaseHandle } from '../../server/db/client';
import {
  outboxMessages,
  reportRuns,
  reportSchedules,
  rosterImports,
} from '../../server/db/schema/index';
import { importRoster } from '../../server/imports/imports-service';
import { createLogger } from '../../server/logger';
import { nudgeOutbox } from '../../server/mail/outbox';
import { runDueSchedules } from '../../server/reports/report-scheduler';
import { toRosterCsv } from '@shared/roster';
import { inventedRoster } from '../bench/roster-import';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

/**
 * Two app instances on one PostgreSQL server, as the README's "Running several app instances"
 * describes: each with its own pool, mail worker and report scheduler. Runs only against a
 * PostgreSQL server (TEST_DATABASE_URL, as CI's `.ci/postgres-suite` sets it): the embedded
 * database is for one process, so in the plain run this suite is reported as skipped, never as
 * passed.
 */
const serverMode = Boolean(process.env['TEST_DATABASE_URL']);

let first: TestApp;
let second: { url: string; database: DatabaseHandle; close(): Promise<void> };

async function startSecondInstance(app: TestApp) {
  const url = (app.database.pool as unknown as { options: { connectionString: string } }).options
    .connectionString;
  const database = await openDatabase({ kind: 'postgres', url });
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-second-instance-'));
  const config = loadConfig({
    TUTTI_DATA_DIR: dataDir,
    OIDC_ISSUER: app.config.oidcIssuer,
    SMTP_URL: app.config.smtpUrl,
    LOG_LEVEL: 'silent',
  });
  const express = await createApp(config, {
    database,
    logger: createLogger('silent'),
    serveWeb: false,
  });
  const server = createHttpServer(express);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  return {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    database,
    async close() {
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
      await (express.locals['stop'] as () => Promise<void>)();
      await database.close();
      fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

async function until(what: string, check: () => Promise<boolean>, timeoutMs = 20_000) {
  const started = Date.now();
  while (!(await check())) {
    if (Date.now() - started > timeoutMs) throw new Error(`Timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

describe.skipIf(!serverMode)('Two app instances on one PostgreSQL server', () => {
  beforeAll(async () => {
    first = await startTestApp();
    second = await startSecondInstance(first);
  });
  afterAll(async () => {
    await second?.close();
    await first?.close();
  });

  it('should honour a session made on one instance on the other', async () => {
    const coordinator = await first.signIn(demoEmail('coordinator'));
    const elsewhere = await request(second.url).get('/api/me').set({ Cookie: coordinator.cookie });
    expect(elsewhere.status).toBe(200);
    expect(elsewhere.body.email).toBe(demoEmail('coordinator'));
    // A write with that session on the second instance passes its same-origin check too.
    const written = await request(second.url)
      .post('/api/tokens')
      .set({ Cookie: coordinator.cookie, Origin: second.url })
      .send({ label: 'made on the second instance' });
    expect(written.status).toBe(201);
  });

  it('should send each queued message once although both mail workers run', async () => {
    first.mail.clear();
    const subjects = Array.from({ length: 12 }, (_, index) => `Two instances, message ${index}`);
    const queued = await first.database.db
      .insert(outboxMessages)
      .values(
        subjects.map((subject) => ({
          kind: 'report' as const,
          to: [demoEmail('coordinator')],
          subject,
          text: subject,
        })),
      )
      .returning({ id: outboxMessages.id });
    nudgeOutbox();
    const ids = queued.map((row) => row.id);
    await until('every message sent', async () => {
      const rows = await first.database.db
        .select({ state: outboxMessages.state })
        .from(outboxMessages)
        .where(inArray(outboxMessages.id, ids));
      return rows.every((row) => row.state === 'sent');
    });
    // Both workers poll every 2 s: give a second sending the time to arrive.
    await new Promise((resolve) => setTimeout(resolve, 3_000));
    const caught = first.mail.messages().filter((message) => subjects.includes(message.subject));
    expect(caught.map((message) => message.subject).sort()).toEqual([...subjects].sort());
  });

  it('should run a due scheduled report once when both instances tick', async () => {
    const [hpms] = rowsOf<{ id: number }>(
      await first.database.db.execute(sql`select id from schools where code = 'HPMS'`),
    );
    const coordinator = await first.signIn(demoEmail('coordinator'));
    const created = await coordinator.post('/api/reports/schedules', {
      kind: 'director',
      cron: '0 7 * * 1',
      timeZone: 'America/Los_Angeles',
      target: { schoolIds: [hpms!.id] },
    });
    expect(created.status).toBe(201);
    const scheduleId: number = created.body.id;
    await first.database.db
      .update(reportSchedules)
      .set({ nextRunAt: new Date(Date.now() - 60_000) })
      .where(eq(reportSchedules.id, scheduleId));
    // Each instance's own scheduler may win the claim too; either way the run happens once.
    await Promise.all([
      runDueSchedules(first.database.db),
      runDueSchedules(second.database.db),
      runDueSchedules(first.database.db),
      runDueSchedules(second.database.db),
    ]);
    const runs = await first.database.db
      .select()
      .from(reportRuns)
      .where(eq(reportRuns.scheduleId, scheduleId));
    expect(runs).toHaveLength(1);
  });

  it('should commit two imports sent at once one after the other', async () => {
    const roster = inventedRoster(600, 23, 640_000);
    const bytes = new TextEncoder().encode(toRosterCsv(roster));
    const students = new Set(roster.map((row) => row.studentId)).size;
    const run = (database: DatabaseHandle, fileName: string) =>
      importRoster(
        database,
        { upload: { fileName, bytes }, withdrawMissing: false, skipInvalid: false },
        null,
        { fileName, via: 'cli' },
      );
    const [one, other] = await Promise.all([
      run(first.database, 'first.csv'),
      run(second.database, 'second.csv'),
    ]);
    expect(one.result.committed && other.result.committed).toBe(true);
    // One added every student; the other, committed after it, found them all there.
    expect([one.result.created, other.result.created].sort((a, b) => a - b)).toEqual([
      0,
      roster.length,
    ]);
    const [count] = rowsOf<{ total: number }>(
      await first.database.db.execute(
        sql`select count(*)::int as total from students where student_number like 'S64%'`,
      ),
    );
    expect(count!.total).toBe(students);
    // Each wrote its own history row.
    const history = await first.database.db
      .select()
      .from(rosterImports)
      .where(inArray(rosterImports.fileName, ['first.csv', 'second.csv']));
    expect(history).toHaveLength(2);
  });
});
