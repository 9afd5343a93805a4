import { eq } from 'drizzle-orm';
import { afterAll, describe, expect, it } from 'vitest';
import { startMailFake, type MailFake } from '../../fakes/mail/index';
import { outboxMessages } from '../../server/db/schema/index';
import { drainOutbox, maxAttempts } from '../../server/mail/mail-worker';
import { enqueueMail, type OutboxMessageInput } from '../../server/mail/outbox';
import { byRole, everyRole, useTestApp } from '../support/test-app';

const restarted: MailFake[] = [];
/** The catcher on the relay's port now: the harness's, until a test restarts it. */
let relay: MailFake | undefined;
const mail = (): MailFake => relay ?? app.mail;

/** Starts a new catcher on the stopped one's SMTP port, as a relay coming back would. */
async function restartMail(port: number) {
  relay = await startMailFake({ smtpPort: port, httpPort: 0 });
  restarted.push(relay);
}

/** Stops the running catcher, as a relay going down would; answers its SMTP port. */
async function stopMail(): Promise<number> {
  const port = Number(new URL(mail().smtpUrl).port);
  await mail().close();
  if (restarted.includes(mail())) restarted.splice(restarted.indexOf(mail()), 1);
  return port;
}

const services = () => ({ db: app.database.db, config: app.config });

function message(overrides: Partial<OutboxMessageInput> = {}): OutboxMessageInput {
  return {
    kind: 'other',
    to: ['someone@merrowbasin.example'],
    subject: 'Sectional moved to Thursday',
    text: 'The low brass sectional meets on Thursday this week.',
    html: '<p>The low brass sectional meets on <strong>Thursday</strong> this week.</p>',
    ...overrides,
  };
}

async function stateOf(id: number) {
  const [row] = await app.database.db
    .select()
    .from(outboxMessages)
    .where(eq(outboxMessages.id, id));
  return row!;
}

const app = useTestApp({ signIn: everyRole });
const { coordinator, director, viewer, student } = byRole(app.clients);
afterAll(async () => {
  // The harness closes the catcher it started; the ones started here close here (before the app:
  // after-all hooks run last registered first).
  await Promise.all(restarted.map((fake) => fake.close()));
});

describe('Outbox', () => {
  it('should keep no message when the transaction that queued it rolls back', async () => {
    const subject = `Rolled back ${Date.now()}`;
    await expect(
      app.database.db.transaction(async (tx) => {
        await enqueueMail(tx, message({ subject }));
        throw new Error('the business change failed');
      }),
    ).rejects.toThrow('the business change failed');
    const listed = await coordinator.get(`/api/outbox?q=${encodeURIComponent(subject)}`);
    expect(listed.body.total).toBe(0);
  });

  it('should deliver both parts and the attachment when the worker drains the outbox', async () => {
    const id = await app.database.db.transaction((tx) =>
      enqueueMail(
        tx,
        message({
          to: ['a.reed@merrowbasin.example', 'b.valve@merrowbasin.example'],
          cc: ['office@merrowbasin.example'],
          subject: 'Folder check',
          attachments: [
            {
              filename: 'folders.csv',
              contentType: 'text/csv',
              content: 'part,count\r\nhorn,4\r\n',
            },
          ],
        }),
      ),
    );
    await drainOutbox(services());
    const row = await stateOf(id);
    expect(row.state).toBe('sent');
    expect(row.attempts).toBe(1);
    const caught = mail()
      .messages()
      .filter((each) => each.subject === 'Folder check');
    expect(caught).toHaveLength(1);
    expect(caught[0]!.to).toEqual(['a.reed@merrowbasin.example', 'b.valve@merrowbasin.example']);
    expect(caught[0]!.cc).toEqual(['office@merrowbasin.example']);
    expect(caught[0]!.text).toContain('low brass sectional');
    expect(caught[0]!.html).toContain('<strong>Thursday</strong>');
    expect(caught[0]!.messageId).toBe(row.messageId);
    expect(mail().attachment(caught[0]!.id, 0)!.toString('utf8')).toBe('part,count\r\nhorn,4\r\n');
  });

  it('should show a director only the messages of their schools or their own', async () => {
    const [hpms, qhms] = await Promise.all([
      enqueueMail(
        app.database.db,
        message({ subject: 'About HPMS', schoolId: app.schoolIds['HPMS'] }),
      ),
      enqueueMail(
        app.database.db,
        message({ subject: 'About QHMS', schoolId: app.schoolIds['QHMS'] }),
      ),
    ]);
    const seen = await director.get('/api/outbox?limit=1000');
    expect(seen.status).toBe(200);
    const ids = seen.body.rows.map((row: { id: number }) => row.id);
    expect(ids).toContain(hpms);
    expect(ids).not.toContain(qhms);
    expect((await director.get(`/api/outbox/${qhms}`)).status).toBe(404);
    const own = await director.get(`/api/outbox/${hpms}`);
    expect(own.body.subject).toBe('About HPMS');
    expect(own.body.text).toContain('sectional');
    const everything = await coordinator.get('/api/outbox?limit=1000');
    const all = everything.body.rows.map((row: { id: number }) => row.id);
    expect(all).toEqual(expect.arrayContaining([hpms, qhms]));
    expect(everything.body.total).toBe(everything.body.rows.length);
  });

  it('should answer 403 when a viewer or a student opens the outbox', async () => {
    expect((await viewer.get('/api/outbox')).status).toBe(403);
    expect((await student.get('/api/outbox')).status).toBe(403);
  });

  it('should filter by state and kind', async () => {
    await drainOutbox(services());
    const queuedReports = await coordinator.get('/api/outbox?state=sent&kind=other&limit=1000');
    expect(queuedReports.body.total).toBeGreaterThan(0);
    for (const row of queuedReports.body.rows) {
      expect(row.state).toBe('sent');
      expect(row.kind).toBe('other');
    }
    expect((await coordinator.get('/api/outbox?state=lost')).status).toBe(400);
  });

  it('should lose nothing and send each message once when the mail relay is down for a while', async () => {
    const port = await stopMail();
    const subjects = ['Relay down 1', 'Relay down 2', 'Relay down 3'];
    const ids = await Promise.all(
      subjects.map((subject) => enqueueMail(app.database.db, message({ subject }))),
    );
    await drainOutbox(services());
    for (const id of ids) {
      const row = await stateOf(id);
      expect(row.state).toBe('queued');
      expect(row.attempts).toBe(1);
      expect(row.lastError).toMatch(/ECONNREFUSED|connect/i);
      // The first retry waits 5 seconds.
      expect(row.nextAttemptAt.getTime()).toBeGreaterThan(Date.now() + 3000);
    }
    const listed = await coordinator.get(`/api/outbox/${ids[0]}`);
    expect(listed.body.lastError).toMatch(/ECONNREFUSED|connect/i);

    await restartMail(port);
    const later = new Date(Date.now() + 60_000);
    await drainOutbox(services(), { now: later });
    await drainOutbox(services(), { now: later });
    for (const id of ids) expect((await stateOf(id)).state).toBe('sent');
    const caught = mail()
      .messages()
      .map((each) => each.subject);
    for (const subject of subjects)
      expect(caught.filter((each) => each === subject)).toHaveLength(1);
  });

  it('should mark a message failed after its last try and queue it again on resend', async () => {
    const port = await stopMail();
    const id = await enqueueMail(
      app.database.db,
      message({ subject: 'Never arrives', schoolId: app.schoolIds['HPMS'] }),
    );
    for (let attempt = 1; attempt <= maxAttempts; attempt += 1) {
      await drainOutbox(services(), { now: new Date(Date.now() + attempt * 86_400_000) });
    }
    const failed = await stateOf(id);
    expect(failed.state).toBe('failed');
    expect(failed.attempts).toBe(maxAttempts);
    expect((await viewer.post(`/api/outbox/${id}/resend`)).status).toBe(403);
    await restartMail(port);
    const resent = await director.post(`/api/outbox/${id}/resend`);
    expect(resent.status).toBe(200);
    expect(resent.body.state).toBe('queued');
    expect((await director.post(`/api/outbox/${id}/resend`)).status).toBe(409);
    await drainOutbox(services());
    expect((await stateOf(id)).state).toBe('sent');
    expect(
      mail()
        .messages()
        .filter((each) => each.subject === 'Never arrives'),
    ).toHaveLength(1);
  });
});
