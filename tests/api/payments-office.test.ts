import { describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { payOnHostedPage, sessionIdOf, until, usePaymentsApp } from './payments-app';
import { binary } from '../support/binary-body';

const { app, coordinator, director, technician, query, lend, startPaying, fee } = usePaymentsApp();

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
    const xlsx = await binary(coordinator.get('/api/fees/export.xlsx'));
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
