import { createHash } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { rowsOf } from '../../server/db/client';
import { useTestApp, type SignedInClient } from '../support/test-app';
import { binary } from '../support/binary-body';

let hpmsId: number;
let tagNumber = 0;

async function query<Row>(text: ReturnType<typeof sql>): Promise<Row[]> {
  return rowsOf<Row>(await app.database.db.execute(text));
}

/** Checks a new tuba out to an HPMS student with a guardian e-mail; answers the loan and its mail. */
async function lendTuba() {
  const instrument = await coordinator.post('/api/instruments', {
    assetTag: `TEST-SIGN-${(tagNumber += 1)}`,
    instrumentId: 'tuba',
    homeSchoolId: hpmsId,
  });
  const [student] = await query<{
    id: number;
    guardian_email: string;
  }>(sql`select s.id, s.guardian_email from students s
    where s.school_id = ${hpmsId} and s.status = 'active' and s.guardian_email is not null
    and not exists (select 1 from loans l where l.student_id = s.id and l.state = 'active') order by s.id desc limit 1`);
  const loan = await director.post('/api/loans', {
    instrumentId: instrument.body.id,
    studentId: student!.id,
    conditionOut: 'good',
    usageFeeCents: 4500,
  });
  expect(loan.status).toBe(201);
  const [message] = await query<{ text: string; html: string; to: string[]; kind: string }>(
    sql`select text, html, "to", kind from outbox_messages where related_type = 'loan' and related_id = ${loan.body.id}`,
  );
  const token = /\/agreements\/([A-Za-z0-9_-]+)/.exec(message?.text ?? '')?.[1];
  return {
    loan: loan.body,
    message: message!,
    token: token!,
    guardianEmail: student!.guardian_email,
  };
}

/** A PUT from a signed-in browser (the test client has no put of its own). */
function put(client: SignedInClient, path: string, body: object) {
  return request(app.url).put(path).set({ Cookie: client.cookie, Origin: app.url }).send(body);
}

function hiddenHash(page: string): string {
  return /name="textHash" value="([0-9a-f]{64})"/.exec(page)![1]!;
}

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'technician'] });
const { coordinator, 'director.hpms': director, technician } = app.clients;
beforeAll(async () => {
  hpmsId = app.schoolIds['HPMS']!;
});

describe('Loan agreements', () => {
  it('should e-mail the guardian a one-time link through the outbox and keep only its hash', async () => {
    const { loan, message, token, guardianEmail } = await lendTuba();
    expect(message.kind).toBe('loan-agreement');
    expect(message.to).toEqual([guardianEmail]);
    expect(token.length).toBeGreaterThanOrEqual(40);
    const [stored] = await query<{ agreement_token_hash: string; agreement_expires_at: Date }>(
      sql`select agreement_token_hash, agreement_expires_at from loans where id = ${loan.id}`,
    );
    expect(stored!.agreement_token_hash).toBe(createHash('sha256').update(token).digest('hex'));
    expect(JSON.stringify(stored)).not.toContain(token);
    const days = (new Date(stored!.agreement_expires_at).getTime() - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(13.9);
    expect(days).toBeLessThanOrEqual(14);
    expect(loan.signed).toBe(false);
  });

  it('should sign with a valid link, record the text hash, and refuse the used link with 410', async () => {
    const { loan, token } = await lendTuba();
    const page = await app.anonymous.get(`/agreements/${token}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain('mouthpieces and reeds are personal');
    expect(page.text).toContain('wheeled case');
    expect(page.text).not.toMatch(/<script/i);
    const signed = await app.anonymous
      .post(`/agreements/${token}`)
      .type('form')
      .send({
        signedName: 'Robin Example-Guardian',
        agree: 'yes',
        textHash: hiddenHash(page.text),
      });
    expect(signed.status).toBe(200);
    expect(signed.text).toContain('Robin Example-Guardian');
    const [row] = await query<{
      signed_text: string;
      agreement_text_hash: string;
      signed_name: string;
    }>(sql`select signed_text, agreement_text_hash, signed_name from loans where id = ${loan.id}`);
    // FIPS 180-4 SHA-256 over the stored text, computed independently with node:crypto.
    expect(row!.agreement_text_hash).toBe(
      createHash('sha256').update(row!.signed_text, 'utf8').digest('hex'),
    );
    expect(row!.signed_text).toContain(loan.assetTag);
    const seen = await director.get(`/api/loans/${loan.id}`);
    expect(seen.body.signed).toBe(true);
    expect(seen.body.signedName).toBe('Robin Example-Guardian');
    const reused = await app.anonymous
      .post(`/agreements/${token}`)
      .type('form')
      .send({ signedName: 'Someone Else', agree: 'yes', textHash: hiddenHash(page.text) });
    expect(reused.status).toBe(410);
    expect((await app.anonymous.get(`/agreements/${token}`)).status).toBe(410);
    const [after] = await query<{ signed_name: string }>(
      sql`select signed_name from loans where id = ${loan.id}`,
    );
    expect(after!.signed_name).toBe('Robin Example-Guardian');
    const pdf = await binary(director.get(`/api/loans/${loan.id}/agreement.pdf`));
    expect(pdf.status).toBe(200);
    expect((pdf.body as Buffer).subarray(0, 5).toString('latin1')).toBe('%PDF-');
  });

  it('should refuse an expired link with 410 and an unknown one with 404', async () => {
    const { loan, token } = await lendTuba();
    await app.database.db.execute(
      sql`update loans set agreement_expires_at = now() - interval '1 minute' where id = ${loan.id}`,
    );
    const page = await app.anonymous.get(`/agreements/${token}`);
    expect(page.status).toBe(410);
    expect(page.text).toMatch(/expired/);
    const post = await app.anonymous
      .post(`/agreements/${token}`)
      .type('form')
      .send({ signedName: 'Late Guardian', agree: 'yes', textHash: '0'.repeat(64) });
    expect(post.status).toBe(410);
    expect((await app.anonymous.get(`/agreements/${'x'.repeat(43)}`)).status).toBe(404);
    expect((await director.get(`/api/loans/${loan.id}`)).body.signed).toBe(false);
  });

  it('should sign the text in force and let only the coordinator change it', async () => {
    const before = await director.get('/api/loans/agreement-text');
    expect(before.body.text).toMatch(/qualified repair technician/);
    const text = `${before.body.text}\n\n8. Concerts. The instrument may be used at school concerts.`;
    expect((await put(director, '/api/loans/agreement-text', { text })).status).toBe(403);
    expect((await put(technician, '/api/loans/agreement-text', { text })).status).toBe(403);
    const { loan, token } = await lendTuba();
    const stalePage = await app.anonymous.get(`/agreements/${token}`);
    const changed = await put(coordinator, '/api/loans/agreement-text', { text });
    expect(changed.status).toBe(200);
    expect(changed.body.version).toBe(before.body.version + 1);
    const stale = await app.anonymous
      .post(`/agreements/${token}`)
      .type('form')
      .send({ signedName: 'Avery Guardian', agree: 'yes', textHash: hiddenHash(stalePage.text) });
    expect(stale.status).toBe(409);
    expect(stale.text).toContain('8. Concerts');
    const signed = await app.anonymous
      .post(`/agreements/${token}`)
      .type('form')
      .send({ signedName: 'Avery Guardian', agree: 'yes', textHash: hiddenHash(stale.text) });
    expect(signed.status).toBe(200);
    const row = (await coordinator.get(`/api/loans/${loan.id}`)).body;
    expect(row.agreementTextVersion).toBe(changed.body.version);
  });

  it('should queue overdue reminders once for the loans a director acts for', async () => {
    const first = await director.post('/api/loans/overdue-reminders', {});
    expect(first.status).toBe(200);
    const [{ expected }] = await query<{
      expected: number;
    }>(sql`select count(*)::int as expected from loans l join students s on s.id = l.student_id
      where l.school_id = ${hpmsId} and l.state = 'active' and l.due_on < current_date and s.guardian_email is not null`);
    expect(expected).toBeGreaterThan(0);
    expect(first.body.queued).toBe(expected);
    const [{ queued }] = await query<{
      queued: number;
    }>(sql`select count(*)::int as queued from outbox_messages m join loans l on l.id = m.related_id
      where m.kind = 'overdue-reminder' and m.related_type = 'loan' and l.school_id <> ${hpmsId}`);
    expect(queued).toBe(0);
    expect((await director.post('/api/loans/overdue-reminders', {})).body.queued).toBe(0);
    expect((await technician.post('/api/loans/overdue-reminders', {})).status).toBe(403);
  });
});
