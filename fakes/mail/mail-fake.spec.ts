import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import nodemailer from 'nodemailer';
import Papa from 'papaparse';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { startMailFake, type CaughtMessage, type MailFake } from './index.js';

const rosterCsv =
  'student_id,first_name,last_name,instrument\r\n' +
  'HP-0042,Zoë,"Lindqvist, Jr.",Alto Saxophone\r\n' +
  'HP-0043,Amara,Quill,French Horn\r\n';

async function send(fake: MailFake, message: nodemailer.SendMailOptions): Promise<void> {
  const { hostname, port } = new URL(fake.smtpUrl);
  const transport = nodemailer.createTransport({
    host: hostname,
    port: Number(port),
    secure: false,
    ignoreTLS: true,
  });
  try {
    await transport.sendMail(message);
  } finally {
    transport.close();
  }
}

function rosterMessage(subject: string): nodemailer.SendMailOptions {
  return {
    from: '"Tuttiboard outbox" <outbox@merrowbasin.example>',
    to: 'director.hpms@merrowbasin.example',
    cc: 'coordinator@merrowbasin.example',
    bcc: 'technician@merrowbasin.example',
    subject,
    text: 'The Heron Point roster is attached.\nTwo students changed instrument.',
    html: '<p>The Heron Point roster is <strong>attached</strong>.</p>',
    attachments: [{ filename: 'roster-hpms.csv', content: rosterCsv, contentType: 'text/csv' }],
  };
}

async function getJson<T>(url: string): Promise<{ status: number; body: T }> {
  const response = await fetch(url);
  return { status: response.status, body: (await response.json()) as T };
}

describe('startMailFake', () => {
  let fake: MailFake;

  beforeAll(async () => {
    fake = await startMailFake({ smtpPort: 0, httpPort: 0 });
  });

  afterEach(() => {
    fake.clear();
  });

  afterAll(async () => {
    await fake.close();
  });

  it('should return the subject, recipients, both parts and the attachment when a message is sent', async () => {
    await send(fake, rosterMessage('Roster for Heron Point Middle'));

    const { body: messages } = await getJson<CaughtMessage[]>(`${fake.httpUrl}/api/messages`);
    expect(messages).toHaveLength(1);
    const { body: message } = await getJson<CaughtMessage>(
      `${fake.httpUrl}/api/messages/${messages[0]!.id}`,
    );
    expect(message.subject).toBe('Roster for Heron Point Middle');
    expect(message.from).toContain('outbox@merrowbasin.example');
    expect(message.to).toEqual([
      'director.hpms@merrowbasin.example',
      'technician@merrowbasin.example',
    ]);
    expect(message.cc).toEqual(['coordinator@merrowbasin.example']);
    expect(message.text.trim()).toBe(
      'The Heron Point roster is attached.\nTwo students changed instrument.',
    );
    expect(message.html).toContain('<strong>attached</strong>');
    expect(message.messageId).toMatch(/^<.+@.+>$/);
    expect(message.attachments).toEqual([
      { filename: 'roster-hpms.csv', contentType: 'text/csv', size: Buffer.byteLength(rosterCsv) },
    ]);

    const download = await fetch(`${fake.httpUrl}/api/messages/${message.id}/attachments/0`);
    expect(download.headers.get('content-type')).toMatch(/^text\/csv/);
    const bytes = Buffer.from(await download.arrayBuffer());
    // RFC 4180: the downloaded file must parse to the same records as the one sent.
    expect(Papa.parse(bytes.toString('utf8')).data).toEqual(Papa.parse(rosterCsv).data);
    expect(fake.attachment(message.id, 0)?.equals(bytes)).toBe(true);
  });

  it('should list the newest message first when several arrive', async () => {
    await send(fake, rosterMessage('First'));
    await send(fake, rosterMessage('Second'));

    const subjects = fake.messages().map((message) => message.subject);
    const { body } = await getJson<CaughtMessage[]>(`${fake.httpUrl}/api/messages`);

    expect(subjects).toEqual(['Second', 'First']);
    expect(body.map((message) => message.subject)).toEqual(['Second', 'First']);
  });

  it('should list the message on the mailbox page when it has arrived', async () => {
    await send(fake, rosterMessage('Loan agreement for asset tag MB-SAX-0017'));
    const [message] = fake.messages();

    const page = await fetch(fake.httpUrl);
    const html = await page.text();
    const messagePage = await (await fetch(`${fake.httpUrl}/messages/${message!.id}`)).text();
    const htmlPart = await fetch(`${fake.httpUrl}/messages/${message!.id}/html`);

    expect(page.headers.get('content-type')).toMatch(/^text\/html/);
    expect(html).toContain('Loan agreement for asset tag MB-SAX-0017');
    expect(html).toContain('director.hpms@merrowbasin.example');
    expect(html).toContain(`href="/messages/${message!.id}"`);
    expect(html).not.toMatch(/<script|https?:\/\//i);
    expect(messagePage).toMatch(/<iframe sandbox src="\/messages\/\d+\/html"/);
    expect(messagePage).toContain('roster-hpms.csv');
    // CSP Level 3 §6.3.2: the sandbox directive isolates the e-mail's HTML from the mailbox.
    expect(htmlPart.headers.get('content-security-policy')).toMatch(/^sandbox;/);
    expect(await htmlPart.text()).toContain('<strong>attached</strong>');
  });

  it('should answer 404 with JSON when the message or attachment does not exist', async () => {
    await send(fake, rosterMessage('Only one'));
    const [message] = fake.messages();

    const missingMessage = await getJson<{ error: string }>(`${fake.httpUrl}/api/messages/9999`);
    const missingAttachment = await getJson<{ error: string }>(
      `${fake.httpUrl}/api/messages/${message!.id}/attachments/1`,
    );
    const badId = await getJson<{ error: string }>(`${fake.httpUrl}/api/messages/abc`);

    expect(missingMessage).toEqual({
      status: 404,
      body: expect.objectContaining({ error: 'not_found' }),
    });
    expect(missingAttachment.status).toBe(404);
    expect(badId.status).toBe(404);
  });

  it('should refuse with 552 and keep nothing when a message is over 25 MB', async () => {
    const oversized = {
      ...rosterMessage('Too big'),
      attachments: [{ filename: 'recording.wav', content: Buffer.alloc(26 * 1024 * 1024, 1) }],
    };

    // RFC 1870: a message over the announced SIZE is refused with reply code 552.
    await expect(send(fake, oversized)).rejects.toThrow(/552/);
    expect(fake.messages()).toEqual([]);
  });

  it('should empty the mailbox when DELETE /api/messages is called', async () => {
    await send(fake, rosterMessage('To be deleted'));

    const response = await fetch(`${fake.httpUrl}/api/messages`, { method: 'DELETE' });
    const { body } = await getJson<CaughtMessage[]>(`${fake.httpUrl}/api/messages`);

    expect(response.status).toBe(204);
    expect(body).toEqual([]);
    expect(fake.messages()).toEqual([]);
  });
});

describe('startMailFake with a store file', () => {
  it('should keep messages and attachments when restarted with the same store file', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'mail-fake-'));
    const storeFile = join(folder, 'mailbox.jsonl');
    try {
      const first = await startMailFake({ smtpPort: 0, httpPort: 0, storeFile });
      await send(first, rosterMessage('Kept across restarts'));
      const [sent] = first.messages();
      await first.close();

      const second = await startMailFake({ smtpPort: 0, httpPort: 0, storeFile });
      try {
        const { body } = await getJson<CaughtMessage[]>(`${second.httpUrl}/api/messages`);
        await send(second, rosterMessage('After the restart'));

        expect(body).toEqual([sent]);
        expect(second.attachment(sent!.id, 0)?.toString('utf8')).toBe(rosterCsv);
        expect(second.messages().map((message) => message.id)).toEqual([sent!.id + 1, sent!.id]);
        second.clear();
      } finally {
        await second.close();
      }
      const third = await startMailFake({ smtpPort: 0, httpPort: 0, storeFile });
      expect(third.messages()).toEqual([]);
      await third.close();
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  });
});
