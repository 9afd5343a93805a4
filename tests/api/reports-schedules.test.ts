import { eq, sql } from 'drizzle-orm';
import { afterAll, describe, expect, it } from 'vitest';
import { startMailFake, type MailFake } from '../../fakes/mail/index';
import { outboxMessages, reportRuns, reportSchedules } from '../../server/db/schema/index';
import { drainOutbox } from '../../server/mail/mail-worker';
import { runDueSchedules } from '../../server/reports/report-scheduler';
import { useTestApp } from '../support/test-app';
import { novemberReport, seedTinyDistrict, type TinyDistrict } from './reports-district';

let district: TinyDistrict;
const restarted: MailFake[] = [];

const services = () => ({ db: app.database.db, config: app.config });

async function runsOf(scheduleId: number) {
  return app.database.db.select().from(reportRuns).where(eq(reportRuns.scheduleId, scheduleId));
}

function localParts(moment: Date, timeZone: string) {
  const parts = new Intl.DateTimeFormat('en-US', {
    timeZone,
    weekday: 'short',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).formatToParts(moment);
  const part = (type: string) => parts.find((each) => each.type === type)!.value;
  return { weekday: part('weekday'), hour: part('hour'), minute: part('minute') };
}

const app = useTestApp({
  template: 'empty',
  seed: async (database) => {
    district = await seedTinyDistrict(database.db);
  },
  signIn: ['coordinator', 'director.hpms'],
});
const { coordinator, 'director.hpms': director } = app.clients;
afterAll(async () => {
  // Before the app closes: after-all hooks run last registered first.
  await Promise.all(restarted.map((fake) => fake.close()));
});

describe('Report schedules', () => {
  let scheduleId: number;

  it('should compute the next Monday at 07:00 in the schedule’s time zone when one is created', async () => {
    const created = await coordinator.post('/api/reports/schedules', {
      kind: 'director',
      cron: '0 7 * * 1',
      timeZone: 'America/Los_Angeles',
      target: { schoolIds: [district.schoolIds.HPMS] },
    });
    expect(created.status).toBe(201);
    scheduleId = created.body.id;
    const next = new Date(created.body.nextRunAt);
    expect(next.getTime()).toBeGreaterThan(Date.now());
    // POSIX crontab: fields are minute, hour, day of month, month, day of week (1 = Monday).
    expect(localParts(next, 'America/Los_Angeles')).toEqual({
      weekday: 'Mon',
      hour: '07',
      minute: '00',
    });
    expect(next.getTime() - Date.now()).toBeLessThanOrEqual(7 * 86_400_000);
  });

  it('should refuse a bad cron expression or time zone, and schedules to anyone but the coordinator', async () => {
    const base = { kind: 'director', target: { schoolIds: [district.schoolIds.HPMS] } };
    expect(
      (await coordinator.post('/api/reports/schedules', { ...base, cron: '0 7 * *' })).status,
    ).toBe(400);
    expect(
      (await coordinator.post('/api/reports/schedules', { ...base, cron: '0 99 * * 1' })).status,
    ).toBe(400);
    expect(
      (
        await coordinator.post('/api/reports/schedules', {
          ...base,
          cron: '0 7 * * 1',
          timeZone: 'Mars/Olympus',
        })
      ).status,
    ).toBe(400);
    expect(
      (await director.post('/api/reports/schedules', { ...base, cron: '0 7 * * 1' })).status,
    ).toBe(403);
    expect((await director.get('/api/reports/schedules')).status).toBe(403);
  });

  it('should run a run missed while the server was down once, however many ticks follow', async () => {
    // Monday 16 November 2026, 07:00 in Los Angeles (UTC−8): three weeks of runs missed since.
    const missed = new Date('2026-11-16T15:00:00Z');
    await app.database.db
      .update(reportSchedules)
      .set({ nextRunAt: missed })
      .where(eq(reportSchedules.id, scheduleId));
    await runDueSchedules(app.database.db);
    await runDueSchedules(app.database.db);
    const runs = await runsOf(scheduleId);
    expect(runs).toHaveLength(1);
    // The week before the missed Monday.
    expect(runs[0]).toMatchObject({
      periodFrom: '2026-11-09',
      periodTo: '2026-11-15',
      kind: 'director',
    });
    const [schedule] = await app.database.db
      .select()
      .from(reportSchedules)
      .where(eq(reportSchedules.id, scheduleId));
    expect(schedule!.nextRunAt!.getTime()).toBeGreaterThan(Date.now());
    expect(schedule!.lastRunAt).not.toBeNull();
    const messages = await app.database.db
      .select()
      .from(outboxMessages)
      .where(sql`${outboxMessages.id} = any(${`{${runs[0]!.outboxMessageIds.join(',')}}`}::int[])`);
    expect(messages.map((message) => message.to)).toEqual([['director.hpms@merrowbasin.example']]);
  });

  it('should send once when two ticks race for the same due run', async () => {
    await app.database.db
      .update(reportSchedules)
      .set({ nextRunAt: new Date(Date.now() - 60_000) })
      .where(eq(reportSchedules.id, scheduleId));
    const ticks = await Promise.all([
      runDueSchedules(app.database.db),
      runDueSchedules(app.database.db),
    ]);
    // The app's own scheduler may win the claim; either way the run happens exactly once.
    expect(ticks.flatMap((tick) => tick.ran).length).toBeLessThanOrEqual(1);
    expect(await runsOf(scheduleId)).toHaveLength(2);
  });

  it('should not run an inactive schedule, and should update with the version and answer 409 when stale', async () => {
    const current = await coordinator.get(`/api/reports/schedules/${scheduleId}`);
    const paused = await coordinator.patch(`/api/reports/schedules/${scheduleId}`, {
      active: false,
      version: current.body.version,
    });
    expect(paused.status).toBe(200);
    expect(paused.body.nextRunAt).toBeNull();
    expect(
      (
        await coordinator.patch(`/api/reports/schedules/${scheduleId}`, {
          active: true,
          version: current.body.version,
        })
      ).status,
    ).toBe(409);
    await app.database.db
      .update(reportSchedules)
      .set({ nextRunAt: new Date(Date.now() - 60_000) })
      .where(eq(reportSchedules.id, scheduleId));
    expect((await runDueSchedules(app.database.db)).ran).toEqual([]);
    expect((await coordinator.get('/api/reports/schedules')).body.total).toBe(1);
    expect((await coordinator.delete(`/api/reports/schedules/${scheduleId}`)).status).toBe(204);
    expect((await coordinator.get(`/api/reports/schedules/${scheduleId}`)).status).toBe(404);
  });
});

describe('Reports while the mail relay is down', () => {
  it('should keep every report queued with the SMTP error and deliver each once when the relay is back', async () => {
    // The schedules' reports go out first, so that only this test's reports are in flight.
    await drainOutbox(services());
    const port = Number(new URL(app.mail.smtpUrl).port);
    await app.mail.close();
    const sent = await coordinator.post(
      '/api/reports/send',
      novemberReport('director', 'all-directors'),
    );
    expect(sent.status).toBe(202);
    expect(sent.body.outboxIds).toHaveLength(2);
    await drainOutbox(services());
    const waiting = await coordinator.get('/api/outbox?kind=report&state=queued');
    expect(waiting.body.rows.map((row: { id: number }) => row.id).sort()).toEqual(
      [...sent.body.outboxIds].sort(),
    );
    for (const row of waiting.body.rows) expect(row.lastError).toMatch(/ECONNREFUSED|connect/i);

    const relay = await startMailFake({ smtpPort: port, httpPort: 0 });
    restarted.push(relay);
    const later = new Date(Date.now() + 60_000);
    await drainOutbox(services(), { now: later });
    await drainOutbox(services(), { now: later });
    const delivered = await coordinator.get('/api/outbox?kind=report&state=sent&limit=1000');
    expect(delivered.body.rows.map((row: { id: number }) => row.id)).toEqual(
      expect.arrayContaining(sent.body.outboxIds),
    );
    const caught = relay.messages().map((message) => `${message.to.join(',')} ${message.subject}`);
    expect(caught.sort()).toEqual([
      'director.hpms@merrowbasin.example Heron Point Middle (HPMS): director report, 2026-11-01 to 2026-11-30',
      'director.qhms@merrowbasin.example Quarry Hill Middle (QHMS): director report, 2026-11-01 to 2026-11-30',
    ]);
  });
});
