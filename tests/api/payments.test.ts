import { createHmac } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import Stripe from 'stripe';
import { rowsOf } from '../../server/db/client';
import { demoEmail, startTestApp, useTestApp, type SignedInClient } from '../support/test-app';

let hpmsId: number;
let tagNumber = 0;

async function query<Row>(text: ReturnType<typeof sql>): Promise<Row[]> {
  return rowsOf<Row>(await app.database.db.execute(text));
}

async function until<T>(
  what: string,
  check: () => Promise<T | undefined | false>,
  timeoutMs = 10_000,
): Promise<T> {
  const started = Date.now();
  for (;;) {
    const value = await check();
    if (value) return value;
    if (Date.now() - started > timeoutMs) throw new Error(`Timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

/** Lends a new instrument to an HPMS student with a guardian e-mail; answers the loan and its pay-link token. */
async function lend(instrumentId = 'tuba', studentId?: number) {
  const instrument = await coordinator.post('/api/instruments', {
    assetTag: `TEST-PAY-${(tagNumber += 1)}`,
    instrumentId,
    homeSchoolId: hpmsId,
  });
  expect(instrument.status).toBe(201);
  const [student] = studentId
    ? [{ id: studentId }]
    : await query<{ id: number }>(sql`select s.id from students s
    where s.school_id = ${hpmsId} and s.status = 'active' and s.guardian_email is not null
    and not exists (select 1 from loans l where l.student_id = s.id) order by s.id desc limit 1`);
  const loan = await director.post('/api/loans', {
    instrumentId: instrument.body.id,
    studentId: student!.id,
    conditionOut: 'good',
    usageFeeCents: 4500,
  });
  expect(loan.status).toBe(201);
  const [message] = await query<{ text: string; html: string }>(
    sql`select text, html from outbox_messages where related_type = 'loan' and related_id = ${loan.body.id} and kind = 'loan-agreement'`,
  );
  const token = /\/pay\/(\d+-[A-Za-z0-9_-]{32})/.exec(message?.text ?? '')?.[1];
  return {
    loan: loan.body as { id: number; usageFeeCents: number; studentId: number },
    token: token!,
    message: message!,
  };
}

/** Presses "Pay the usage fee": answers the hosted page's address. */
async function startPaying(token: string): Promise<string> {
  const response = await app.anonymous.post(`/pay/${token}`).type('form').send({});
  expect(response.status).toBe(303);
  return response.headers['location'] as string;
}

/** Pays on the fake's hosted page as a guardian would, with a card number typed with spaces. */
async function payOnHostedPage(hostedUrl: string, card: string) {
  const url = new URL(hostedUrl);
  return request(url.origin)
    .post(url.pathname)
    .type('form')
    .send({ card, expiry: '12 / 34', cvc: '123' });
}

async function fee(loanId: number) {
  const response = await coordinator.get(`/api/fees/${loanId}`);
  expect(response.status).toBe(200);
  return response.body as {
    fee: {
      status: string;
      paidCents: number;
      refundedCents: number;
      owedCents: number;
      mismatchCents: number;
    };
    ledger: {
      kind: string;
      amountCents: number;
      reference: string | null;
      reason: string | null;
    }[];
    attempts: { attempt: number; sessionId: string; status: string; note: string | null }[];
  };
}

function put(client: SignedInClient, path: string) {
  return request(app.url).put(path).set('Cookie', client.cookie).set('Origin', app.url);
}

const sessionIdOf = (hostedUrl: string) => new URL(hostedUrl).pathname.split('/').pop()!;

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'technician'] });
const { coordinator, 'director.hpms': director, technician } = app.clients;
beforeAll(async () => {
  hpmsId = app.schoolIds['HPMS']!;
  const schedule = await coordinator.get('/api/fees/schedule');
  const saved = await put(coordinator, '/api/fees/schedule').send({
    entries: [
      { scope: 'family', key: 'brass', yearlyFeeCents: 4500 },
      { scope: 'family', key: 'woodwind', yearlyFeeCents: 4000 },
      { scope: 'instrument', key: 'tuba', yearlyFeeCents: 7500 },
    ],
    additionalLoan: { basis: 'student', percent: 50 },
    waiverReasons: ['Free or reduced-price meals', 'Hardship approved by the principal'],
    version: schedule.body.version,
  });
  expect(saved.status).toBe(200);
});

describe('fee schedule', () => {
  it('should be edited by the coordinator only, and refuse unknown instruments with 400', async () => {
    const schedule = (await coordinator.get('/api/fees/schedule')).body;
    expect(schedule.onlinePayments).toBe(true);
    const byDirector = await put(director, '/api/fees/schedule').send(schedule);
    expect(byDirector.status).toBe(403);
    const bad = await put(coordinator, '/api/fees/schedule').send({
      ...schedule,
      entries: [{ scope: 'instrument', key: 'kazoo-9000', yearlyFeeCents: 100 }],
    });
    expect(bad.status).toBe(400);
    expect((await coordinator.get('/api/fees/schedule')).body.entries).toHaveLength(3);
  });

  it('should compute the fee on the server: the instrument entry before the family, half for a second loan of the year', async () => {
    const first = await lend('tuba');
    // The schedule above: tuba 75.00 (its own entry beats brass 45.00), whatever the client sent.
    expect(first.loan.usageFeeCents).toBe(7500);
    const second = await lend('trumpet', first.loan.studentId);
    // Second-instrument rule at 50% (common practice, no source): 45.00 / 2.
    expect(second.loan.usageFeeCents).toBe(2250);
    expect(first.message.html).toContain('Pay the usage fee');
  });
});

describe('fee quote and waiver reasons at checkout', () => {
  async function freshFlute() {
    const instrument = await coordinator.post('/api/instruments', {
      assetTag: `TEST-PAY-${(tagNumber += 1)}`,
      instrumentId: 'flute',
      homeSchoolId: hpmsId,
    });
    expect(instrument.status).toBe(201);
    const [student] = await query<{ id: number }>(
      sql`select s.id from students s where s.school_id = ${hpmsId} and s.status = 'active' and not exists (select 1 from loans l where l.student_id = s.id) order by s.id desc limit 1`,
    );
    return { instrumentId: instrument.body.id as number, studentId: student!.id };
  }

  it('should quote the scheduled fee for an instrument and student, with the waiver reasons', async () => {
    const { instrumentId, studentId } = await freshFlute();
    const quote = await director.get(
      `/api/fees/quote?instrumentId=${instrumentId}&studentId=${studentId}`,
    );
    expect(quote.status).toBe(200);
    // The schedule above: flute is a woodwind, 40.00 a year; the student has no loan yet.
    expect(quote.body).toEqual({
      feeCents: 4000,
      basis: 'family woodwind',
      waiverReasons: ['Free or reduced-price meals', 'Hardship approved by the principal'],
    });
    const extra = await director.get(
      `/api/fees/quote?instrumentId=${instrumentId}&studentId=${studentId}&fee=1`,
    );
    expect(extra.status).toBe(400);
    const missing = await director.get(`/api/fees/quote?instrumentId=${instrumentId}`);
    expect(missing.status).toBe(400);
    expect(JSON.stringify(missing.body)).toContain('studentId');
    expect(
      (await technician.get(`/api/fees/quote?instrumentId=${instrumentId}&studentId=${studentId}`))
        .status,
    ).toBe(403);
  });

  it('should quote no fee where no schedule line covers the instrument', async () => {
    const violin = await coordinator.post('/api/instruments', {
      assetTag: `TEST-PAY-${(tagNumber += 1)}`,
      instrumentId: 'violin',
      homeSchoolId: hpmsId,
    });
    expect(violin.status).toBe(201);
    const { studentId } = await freshFlute();
    const quote = await director.get(
      `/api/fees/quote?instrumentId=${violin.body.id}&studentId=${studentId}`,
    );
    expect(quote.status).toBe(200);
    expect(quote.body.feeCents).toBeNull();
  });

  it('should refuse a waiver without a reason, or with one not on the list, and lend nothing', async () => {
    const { instrumentId, studentId } = await freshFlute();
    const loansBefore = await query<{ count: number }>(
      sql`select count(*)::int as count from loans`,
    );
    const base = { instrumentId, studentId, conditionOut: 'good', waiver: true };
    const noReason = await director.post('/api/loans', base);
    expect(noReason.status).toBe(400);
    expect(JSON.stringify(noReason.body)).toContain('waiverReason');
    const blank = await director.post('/api/loans', { ...base, waiverReason: '   ' });
    expect(blank.status).toBe(400);
    const offList = await director.post('/api/loans', {
      ...base,
      waiverReason: 'Because I said so',
    });
    expect(offList.status).toBe(400);
    expect(offList.body.error.message).toContain('not one of the district’s waiver reasons');
    expect(JSON.stringify(offList.body)).toContain('waiverReason');
    expect(await query<{ count: number }>(sql`select count(*)::int as count from loans`)).toEqual(
      loansBefore,
    );
    const [instrument] = await query<{ status: string }>(
      sql`select status from instruments where id = ${instrumentId}`,
    );
    expect(instrument!.status).toBe('available');
    const listed = await director.post('/api/loans', {
      ...base,
      waiverReason: 'Hardship approved by the principal',
    });
    expect(listed.status).toBe(201);
    expect(listed.body.usageFeeCents).toBe(0);
  });
});

describe('paying through the hosted page', () => {
  it('should count a payment only when the signed event arrives, send a receipt, and refuse a second session', async () => {
    const { loan, token } = await lend('trombone');
    expect((await app.anonymous.get(`/pay/${token}`)).text).toContain('Pay the usage fee');
    const hosted = await startPaying(token);
    const session = app.payments.sessions().find((each) => each.id === sessionIdOf(hosted))!;
    expect(session.amount_total).toBe(4500);
    expect(session.currency).toBe('usd');
    expect(session.metadata).toEqual({
      loanId: String(loan.id),
      studentId: String(loan.studentId),
      attempt: '1',
    });
    const page = await request(new URL(hosted).origin).get(new URL(hosted).pathname);
    expect(page.text).toContain('Card number');

    app.payments.holdWebhooks();
    const paid = await payOnHostedPage(hosted, '4242 4242 4242 4242');
    expect(paid.status).toBe(303);
    expect(paid.headers['location']).toBe(`${app.url}/pay/${token}/done?session_id=${session.id}`);
    // Back on our result page before the event: not yet counted.
    expect((await app.anonymous.get(`/pay/${token}/done?session_id=${session.id}`)).text).toContain(
      'being confirmed',
    );
    expect((await fee(loan.id)).fee.status).toBe('owed');
    app.payments.releaseWebhooks();
    await until('the payment', async () => (await fee(loan.id)).fee.status === 'paid');
    expect((await app.anonymous.get(`/pay/${token}/done`)).text).toContain('the usage fee is paid');
    const detail = await fee(loan.id);
    expect(detail.ledger).toEqual([
      expect.objectContaining({ kind: 'payment', amountCents: 4500 }),
    ]);
    const receipts = await query<{ subject: string }>(
      sql`select subject from outbox_messages where related_id = ${loan.id} and kind = 'fee-receipt'`,
    );
    expect(receipts).toHaveLength(1);

    const sessionsBefore = app.payments.sessions().length;
    const again = await app.anonymous.post(`/pay/${token}`).type('form').send({});
    expect(again.status).toBe(409);
    expect(again.text).toContain('has been paid');
    expect(app.payments.sessions()).toHaveLength(sessionsBefore);
  });

  it('should leave a declined card owed, with nothing recorded', async () => {
    const { loan, token } = await lend('trombone');
    const hosted = await startPaying(token);
    const declined = await payOnHostedPage(hosted, '4000 0000 0000 0002');
    expect(declined.status).toBe(402);
    expect(declined.text).toContain('Your card was declined.');
    await app.payments.webhooksSettled();
    const detail = await fee(loan.id);
    expect(detail.fee.status).toBe('owed');
    expect(detail.ledger).toEqual([]);
    expect(detail.attempts.map((attempt) => attempt.status)).toEqual(['open']);
  });

  it('should mark a session expired when the service says so, and open a new one on the next try', async () => {
    const { loan, token } = await lend('trombone');
    const hosted = await startPaying(token);
    app.payments.timeOut(sessionIdOf(hosted));
    await until('the expiry', async () => (await fee(loan.id)).attempts[0]?.status === 'expired');
    const next = await startPaying(token);
    expect(sessionIdOf(next)).not.toBe(sessionIdOf(hosted));
    expect((await fee(loan.id)).attempts.map((attempt) => attempt.attempt)).toEqual([1, 2]);
  });

  it('should refuse a waived loan without opening a session', async () => {
    const instrument = await coordinator.post('/api/instruments', {
      assetTag: `TEST-PAY-${(tagNumber += 1)}`,
      instrumentId: 'flute',
      homeSchoolId: hpmsId,
    });
    const [student] = await query<{ id: number }>(
      sql`select s.id from students s where s.school_id = ${hpmsId} and s.status = 'active' and s.guardian_email is not null and not exists (select 1 from loans l where l.student_id = s.id) order by s.id limit 1`,
    );
    const loan = await director.post('/api/loans', {
      instrumentId: instrument.body.id,
      studentId: student!.id,
      conditionOut: 'good',
      waiver: true,
      waiverReason: 'Free or reduced-price meals',
    });
    expect(loan.status).toBe(201);
    const [message] = await query<{ text: string }>(
      sql`select text from outbox_messages where related_id = ${loan.body.id} and kind = 'loan-agreement'`,
    );
    expect(message!.text).not.toContain('/pay/');
    const before = app.payments.sessions().length;
    const tokens = await import('../../server/payments/payments-service').then((module) =>
      module.payTokens(app.database.db, app.config),
    );
    const refused = await app.anonymous
      .post(`/pay/${tokens(loan.body.id)}`)
      .type('form')
      .send({});
    expect(refused.status).toBe(409);
    expect(refused.text).toContain('waived');
    expect(app.payments.sessions()).toHaveLength(before);
  });
});

describe('webhooks', () => {
  it('should change nothing when an event is replayed', async () => {
    const { loan, token } = await lend('trombone');
    const hosted = await startPaying(token);
    await payOnHostedPage(hosted, '4242424242424242');
    await until('the payment', async () => (await fee(loan.id)).fee.status === 'paid');
    const event = app.payments
      .events()
      .find(
        (each) =>
          each.type === 'checkout.session.completed' &&
          (each.data.object as { id: string }).id === sessionIdOf(hosted),
      )!;
    expect(app.payments.resendEvent(event.id)).toBe(true);
    await app.payments.webhooksSettled();
    const replays = app.payments.deliveries().filter((delivery) => delivery.eventId === event.id);
    expect(replays.map((delivery) => delivery.status)).toEqual([200, 200]);
    expect((await fee(loan.id)).ledger).toHaveLength(1);
    const receipts = await query<{ id: number }>(
      sql`select id from outbox_messages where related_id = ${loan.id} and kind = 'fee-receipt'`,
    );
    expect(receipts).toHaveLength(1);
  });

  it('should answer 400 and write nothing for a missing, forged or stale signature', async () => {
    const before = await query<{ count: number }>(
      sql`select count(*)::int as count from payment_events`,
    );
    const payload = JSON.stringify({
      id: 'evt_forged',
      object: 'event',
      type: 'checkout.session.completed',
      data: { object: { id: 'cs_x' } },
    });
    const now = Math.floor(Date.now() / 1000);
    // The service's published scheme: v1 = hex HMAC-SHA256 of "<t>.<payload>" under the endpoint secret.
    const sign = (secret: string, t: number) =>
      `t=${t},v1=${createHmac('sha256', secret).update(`${t}.${payload}`).digest('hex')}`;
    const post = (signature?: string) => {
      const call = app.anonymous
        .post('/api/payments/webhook')
        .set('Content-Type', 'application/json');
      return (signature ? call.set('Stripe-Signature', signature) : call).send(payload);
    };
    expect((await post()).status).toBe(400);
    expect((await post(sign('whsec_not_the_secret', now))).status).toBe(400);
    // The SDK's default tolerance is 300 seconds; ten minutes old is stale.
    expect((await post(sign(app.payments.webhookSecret, now - 600))).status).toBe(400);
    const after = await query<{ count: number }>(
      sql`select count(*)::int as count from payment_events`,
    );
    expect(after[0]!.count).toBe(before[0]!.count);
    // The same payload correctly signed now is taken (and names no session of ours).
    const taken = await post(sign(app.payments.webhookSecret, now));
    expect(taken.status).toBe(200);
    expect(taken.body.outcome).toContain('unknown session');
  });

  it('should sign events so that the SDK itself accepts them', async () => {
    const event = app.payments.events().at(-1)!;
    const payload = JSON.stringify(event, null, 2);
    const header = (await import('../../fakes/payments/index')).signatureHeader(
      payload,
      app.payments.webhookSecret,
      Math.floor(Date.now() / 1000),
    );
    // Independent check: the SDK's own verifier (stripe-node Webhooks.constructEvent).
    const verified = new Stripe('sk_test_unused').webhooks.constructEvent(
      payload,
      header,
      app.payments.webhookSecret,
    );
    expect(verified.id).toBe(event.id);
  });

  it('should record an amount that differs from the fee as a mismatch, never as paid', async () => {
    const { loan, token } = await lend('trombone');
    const hosted = await startPaying(token);
    const session = app.payments.sessions().find((each) => each.id === sessionIdOf(hosted))!;
    const payload = JSON.stringify({
      id: `evt_mismatch_${loan.id}`,
      object: 'event',
      type: 'checkout.session.completed',
      data: {
        object: {
          ...session,
          status: 'complete',
          payment_status: 'paid',
          amount_total: 100,
          payment_intent: `pi_mismatch_${loan.id}`,
        },
      },
    });
    const t = Math.floor(Date.now() / 1000);
    const signature = `t=${t},v1=${createHmac('sha256', app.payments.webhookSecret).update(`${t}.${payload}`).digest('hex')}`;
    const answer = await app.anonymous
      .post('/api/payments/webhook')
      .set('Content-Type', 'application/json')
      .set('Stripe-Signature', signature)
      .send(payload);
    expect(answer.status).toBe(200);
    const detail = await fee(loan.id);
    expect(detail.fee.status).toBe('mismatch');
    expect(detail.fee.paidCents).toBe(0);
    expect(detail.fee.mismatchCents).toBe(100);
    expect(detail.attempts[0]!.status).toBe('mismatch');
    expect((await app.anonymous.post(`/pay/${token}`).type('form').send({})).status).toBe(409);
  });
});

describe('two tabs', () => {
  it('should expire the other session when one is paid, and say so in the ledger', async () => {
    const { loan, token } = await lend('trombone');
    const [first, second] = [await startPaying(token), await startPaying(token)];
    expect(sessionIdOf(first)).not.toBe(sessionIdOf(second));
    await payOnHostedPage(first, '4242424242424242');
    await until(
      'the other session expired',
      async () =>
        app.payments.sessions().find((each) => each.id === sessionIdOf(second))?.status ===
        'expired',
    );
    const detail = await until('the ledger', async () => {
      const current = await fee(loan.id);
      return current.attempts[1]?.status === 'superseded' && current;
    });
    expect(detail.attempts[1]!.note).toContain(sessionIdOf(first));
    expect((await payOnHostedPage(second, '4242424242424242')).status).toBe(410);
    expect(detail.fee.paidCents).toBe(4500);
  });

  it('should refund the second of two payments made before either event arrived', async () => {
    const { loan, token } = await lend('trombone');
    const [first, second] = [await startPaying(token), await startPaying(token)];
    app.payments.holdWebhooks();
    await payOnHostedPage(first, '4242424242424242');
    await payOnHostedPage(second, '4242424242424242');
    app.payments.releaseWebhooks();
    const detail = await until('the duplicate refunded', async () => {
      const current = await fee(loan.id);
      return current.ledger.some((entry) => entry.kind === 'refund') && current;
    });
    expect(detail.fee.status).toBe('paid');
    expect(detail.fee.paidCents - detail.fee.refundedCents).toBe(4500);
    expect(detail.attempts.map((attempt) => attempt.status).sort()).toEqual([
      'duplicate-refunded',
      'paid',
    ]);
    expect(detail.ledger.find((entry) => entry.kind === 'refund')!.reason).toMatch(
      /Duplicate payment refunded automatically/,
    );
    expect(
      app.payments.refunds().filter((refund) => refund.metadata['loanId'] === String(loan.id)),
    ).toHaveLength(1);
  });
});

describe('the business office', () => {
  it('should e-mail an unpaid-fee reminder with the pay link, and refuse one for a paid fee', async () => {
    const { loan, token } = await lend('trombone');
    const reminded = await director.post(`/api/fees/${loan.id}/reminder`);
    expect(reminded.status).toBe(200);
    expect(reminded.body.queued).toBe(1);
    const [reminder] = await query<{ text: string; html: string }>(
      sql`select text, html from outbox_messages where related_id = ${loan.id} and kind = 'fee-reminder'`,
    );
    expect(reminder!.text).toContain(`/pay/${token}`);
    expect(reminder!.html).toContain('Pay the usage fee');
    await payOnHostedPage(await startPaying(token), '4242424242424242');
    await until('the payment', async () => (await fee(loan.id)).fee.status === 'paid');
    expect((await director.post(`/api/fees/${loan.id}/reminder`)).status).toBe(409);
  });

  it('should refund part of a payment through the service, once, with a receipt', async () => {
    const { loan, token } = await lend('trombone');
    await payOnHostedPage(await startPaying(token), '4242424242424242');
    await until('the payment', async () => (await fee(loan.id)).fee.status === 'paid');
    expect(
      (
        await director.post(`/api/fees/${loan.id}/refunds`, {
          amountCents: 1000,
          reason: 'Returned early',
        })
      ).status,
    ).toBe(403);
    expect(
      (
        await coordinator.post(`/api/fees/${loan.id}/refunds`, {
          amountCents: 999_999,
          reason: 'Too much',
        })
      ).status,
    ).toBe(400);
    const refunded = await coordinator.post(`/api/fees/${loan.id}/refunds`, {
      amountCents: 1500,
      reason: 'Returned in January',
    });
    expect(refunded.status).toBe(200);
    expect(refunded.body.refundedCents).toBe(1500);
    expect(refunded.body.status).toBe('refunded');
    await app.payments.webhooksSettled();
    const detail = await fee(loan.id);
    expect(detail.ledger.filter((entry) => entry.kind === 'refund')).toEqual([
      expect.objectContaining({ amountCents: 1500, reason: 'Returned in January' }),
    ]);
    expect(
      app.payments.refunds().find((refund) => refund.id === detail.ledger[1]!.reference)!.amount,
    ).toBe(1500);
    const receipts = await query<{ subject: string }>(
      sql`select subject from outbox_messages where related_id = ${loan.id} and kind = 'fee-receipt' order by id`,
    );
    expect(receipts.map((receipt) => receipt.subject.split(':')[0])).toEqual(['Receipt', 'Refund']);
  });

  it('should reconcile the service against the ledger and flag a payment missing from it', async () => {
    const reconciliation = await coordinator.get('/api/fees/reconciliation');
    expect(reconciliation.status).toBe(200);
    const paidSessions = app.payments
      .sessions()
      .filter((session) => session.payment_status === 'paid');
    expect(
      reconciliation.body.rows.filter((row: { sessionId: string }) =>
        paidSessions.some((session) => session.id === row.sessionId),
      ),
    ).toHaveLength(paidSessions.length);
    expect(reconciliation.body.rows.every((row: { ok: boolean }) => row.ok)).toBe(true);
    expect(reconciliation.body.mismatches).toBe(0);
    // A payment the service took whose event has not reached us yet is flagged.
    const { token } = await lend('trombone');
    app.payments.holdWebhooks();
    const hosted = await startPaying(token);
    await payOnHostedPage(hosted, '4242424242424242');
    const flagged = (await coordinator.get('/api/fees/reconciliation')).body;
    expect(flagged.mismatches).toBe(1);
    expect(
      flagged.rows.find((row: { sessionId: string }) => row.sessionId === sessionIdOf(hosted)),
    ).toMatchObject({ ok: false, ledgerPaidCents: 0, serviceAmountCents: 4500 });
    app.payments.releaseWebhooks();
    await until(
      'the ledger to catch up',
      async () => (await coordinator.get('/api/fees/reconciliation')).body.mismatches === 0,
    );
    expect((await director.get('/api/fees/reconciliation')).status).toBe(403);
  });

  it('should show technicians paid and owed without waiver reasons, and export CSV and XLSX', async () => {
    const list = await technician.get('/api/fees?limit=500');
    expect(list.status).toBe(200);
    expect(list.body.rows.length).toBeGreaterThan(0);
    expect(JSON.stringify(list.body)).not.toContain('waiverReason');
    expect((await technician.get('/api/fees/1')).status).toBe(403);
    const csv = await coordinator.get('/api/fees/export.csv');
    expect(csv.status).toBe(200);
    expect(csv.text.split('\r\n')[0]).toContain('Waiver reason');
    const xlsx = await coordinator
      .get('/api/fees/export.xlsx')
      .buffer(true)
      .parse((response, done) => {
        const chunks: Buffer[] = [];
        response.on('data', (chunk: Buffer) => chunks.push(chunk));
        response.on('end', () => done(null, Buffer.concat(chunks)));
      });
    // An XLSX file is a ZIP archive (ECMA-376 Part 2): it starts with the local file header "PK\x03\x04".
    expect((xlsx.body as Buffer).subarray(0, 4)).toEqual(Buffer.from([0x50, 0x4b, 0x03, 0x04]));
  });
});

describe('the service down', () => {
  it('should tell the guardian payments are unavailable and record nothing', async () => {
    const { loan, token } = await lend('trombone');
    await app.payments.close();
    const answer = await app.anonymous.post(`/pay/${token}`).type('form').send({});
    expect(answer.status).toBe(503);
    expect(answer.text).toContain('Payments are unavailable, try later');
    const detail = await fee(loan.id);
    expect(detail.attempts).toEqual([]);
    expect(detail.fee.status).toBe('owed');
  });
});

describe('the demo district', () => {
  it('should have paid, waived, owed and one refunded loan', async () => {
    const statuses = new Map<string, number>();
    for (const status of ['paid', 'waived', 'owed', 'refunded']) {
      const list = await coordinator.get(`/api/fees?status=${status}&limit=500`);
      expect(list.status).toBe(200);
      const demoRows = (list.body.rows as { assetTag: string }[]).filter(
        (row) => !row.assetTag.startsWith('TEST-'),
      );
      statuses.set(status, demoRows.length);
    }
    expect(statuses.get('paid')).toBeGreaterThan(0);
    expect(statuses.get('waived')).toBeGreaterThan(0);
    expect(statuses.get('owed')).toBeGreaterThan(0);
    expect(statuses.get('refunded')).toBe(1);
  });
});

describe('without PAYMENTS_SECRET_KEY', () => {
  it('should offer no online payment: no pay link in the e-mail, pay the director instead', async () => {
    const offline = await startTestApp({ payments: false });
    try {
      const coordinatorOffline = await offline.signIn(demoEmail('coordinator'));
      expect((await coordinatorOffline.get('/api/fees/schedule')).body.onlinePayments).toBe(false);
      const instrument = await coordinatorOffline.post('/api/instruments', {
        assetTag: 'TEST-OFFLINE-1',
        instrumentId: 'trombone',
        homeSchoolId: hpmsId,
      });
      const [student] = rowsOf<{ id: number }>(
        await offline.database.db.execute(
          sql`select s.id from students s where s.school_id = ${hpmsId} and s.status = 'active' and s.guardian_email is not null and not exists (select 1 from loans l where l.student_id = s.id) order by s.id limit 1`,
        ),
      );
      const loan = await coordinatorOffline.post('/api/loans', {
        instrumentId: instrument.body.id,
        studentId: student!.id,
        conditionOut: 'good',
      });
      expect(loan.status).toBe(201);
      const [message] = rowsOf<{ text: string }>(
        await offline.database.db.execute(
          sql`select text from outbox_messages where related_id = ${loan.body.id} and kind = 'loan-agreement'`,
        ),
      );
      expect(message!.text).not.toContain('/pay/');
      const token = /\/agreements\/([A-Za-z0-9_-]+)/.exec(message!.text)![1]!;
      expect((await offline.anonymous.get(`/agreements/${token}`)).text).not.toContain(
        'Pay the usage fee',
      );
      // Fees by hand, as before.
      const byHand = await coordinatorOffline.post(`/api/fees/${loan.body.id}/payments`, {
        amountCents: 4500,
        note: 'Cheque 2231',
      });
      expect(byHand.status).toBe(201);
      expect(byHand.body.status).toBe('paid');
    } finally {
      await offline.close();
    }
  });
});
