import { describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { rowsOf } from '../../server/db/client';
import { demoEmail, startTestApp } from '../support/test-app';
import { usePaymentsApp } from './payments-app';

const { coordinator, director, technician, nextTag, hpmsId, query, lend, put } = usePaymentsApp();

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
      assetTag: nextTag(),
      instrumentId: 'flute',
      homeSchoolId: hpmsId(),
    });
    expect(instrument.status).toBe(201);
    const [student] = await query<{ id: number }>(
      sql`select s.id from students s where s.school_id = ${hpmsId()} and s.status = 'active' and not exists (select 1 from loans l where l.student_id = s.id) order by s.id desc limit 1`,
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
      assetTag: nextTag(),
      instrumentId: 'violin',
      homeSchoolId: hpmsId(),
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
        homeSchoolId: hpmsId(),
      });
      const [student] = rowsOf<{ id: number }>(
        await offline.database.db.execute(
          sql`select s.id from students s where s.school_id = ${hpmsId()} and s.status = 'active' and s.guardian_email is not null and not exists (select 1 from loans l where l.student_id = s.id) order by s.id limit 1`,
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
