import { createHmac } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import Stripe from 'stripe';
import { payOnHostedPage, sessionIdOf, until, usePaymentsApp } from './payments-app';

const { app, coordinator, director, nextTag, hpmsId, query, lend, startPaying, fee } =
  usePaymentsApp();

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
      assetTag: nextTag(),
      instrumentId: 'flute',
      homeSchoolId: hpmsId(),
    });
    const [student] = await query<{ id: number }>(
      sql`select s.id from students s where s.school_id = ${hpmsId()} and s.status = 'active' and s.guardian_email is not null and not exists (select 1 from loans l where l.student_id = s.id) order by s.id limit 1`,
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
