import { beforeAll, expect } from 'vitest';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { rowsOf } from '../../server/db/client';
import { useTestApp, type SignedInClient } from '../support/test-app';

/** Asks `check` every 50 ms until it answers something, for what arrives by webhook or e-mail. */
export async function until<T>(
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

export const sessionIdOf = (hostedUrl: string) => new URL(hostedUrl).pathname.split('/').pop()!;

/** Pays on the fake's hosted page as a guardian would, with a card number typed with spaces. */
export async function payOnHostedPage(hostedUrl: string, card: string) {
  const url = new URL(hostedUrl);
  return request(url.origin)
    .post(url.pathname)
    .type('form')
    .send({ card, expiry: '12 / 34', cvc: '123' });
}

/**
 * The demo district's app for a payments test file, with the coordinator, an HPMS director and
 * the technician signed in and a fee schedule saved (brass 45.00, woodwind 40.00, tuba 75.00, half
 * for a student's second loan), and the steps those files take: lend, pay, read a fee.
 */
export function usePaymentsApp() {
  const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'technician'] });
  const { coordinator, 'director.hpms': director, technician } = app.clients;
  let tagNumber = 0;
  /** A new asset tag for an instrument a test adds. */
  const nextTag = () => `TEST-PAY-${(tagNumber += 1)}`;
  const hpmsId = () => app.schoolIds['HPMS']!;

  async function query<Row>(text: ReturnType<typeof sql>): Promise<Row[]> {
    return rowsOf<Row>(await app.database.db.execute(text));
  }

  /** Lends a new instrument to an HPMS student with a guardian e-mail; answers the loan and its pay-link token. */
  async function lend(instrumentId = 'tuba', studentId?: number) {
    const instrument = await coordinator.post('/api/instruments', {
      assetTag: nextTag(),
      instrumentId,
      homeSchoolId: hpmsId(),
    });
    expect(instrument.status).toBe(201);
    const [student] = studentId
      ? [{ id: studentId }]
      : await query<{ id: number }>(sql`select s.id from students s
    where s.school_id = ${hpmsId()} and s.status = 'active' and s.guardian_email is not null
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

  beforeAll(async () => {
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

  return {
    app,
    coordinator,
    director,
    technician,
    nextTag,
    hpmsId,
    query,
    lend,
    startPaying,
    fee,
    put,
  };
}
