import { createHmac, timingSafeEqual } from 'node:crypto';
import { and, eq, max, ne, sql } from 'drizzle-orm';
import type Stripe from 'stripe';
import type { Config } from '../config';
import type { Database, Transaction } from '../db/client';
import { feeLedger, feePaymentAttempts, loans, paymentEvents } from '../db/schema/index';
import type { Reconciliation, RefundInput } from '@shared/api/fee';
import { sessionSecret } from '../core/settings';
import { recordAudit } from '../core/audit';
import { badRequest, HttpError } from '../core/errors';
import type { Actor } from '../core/policy';
import type { Logger } from '../logger';
import { stateConflict } from '../instruments/instruments-service';
import { findLoanRow, type LoanRow } from '../loans/loans-queries';
import { feeRowOf } from './fees-queries';
import { isServiceDown, paymentsClient, paymentsUnavailable } from './payments-client';
import { queueFeeReceipt } from './fee-mail';

/** Fees are charged in US dollars; amounts are in cents (the currency's minor unit). */
export const feeCurrency = 'usd';

// ---------------------------------------------------------------------------------------------
// The guardian's pay link: `<loan id>-<HMAC>`, checked by recomputing it; no table to keep.

async function payLinkKey(db: Database, config: Config): Promise<Buffer> {
  return createHmac('sha256', await sessionSecret(db, config.sessionSecret))
    .update('loan-fee-pay-link')
    .digest();
}

/** A function giving each loan's pay-link token, for use inside a transaction. */
export async function payTokens(db: Database, config: Config): Promise<(loanId: number) => string> {
  const key = await payLinkKey(db, config);
  return (loanId) =>
    `${loanId}-${createHmac('sha256', key).update(String(loanId)).digest('base64url').slice(0, 32)}`;
}

/** The loan a pay-link token names, or undefined for a token we did not make. */
export async function loanOfPayToken(
  db: Database,
  config: Config,
  token: string,
): Promise<number | undefined> {
  const match = /^(\d{1,9})-([A-Za-z0-9_-]{32})$/.exec(token);
  if (!match) return undefined;
  const expected = (await payTokens(db, config))(Number(match[1]));
  const given = Buffer.from(token);
  const wanted = Buffer.from(expected);
  return given.length === wanted.length && timingSafeEqual(given, wanted)
    ? Number(match[1])
    : undefined;
}

// ---------------------------------------------------------------------------------------------
// Starting a hosted checkout.

/** What asking to pay did. */
export type CheckoutOutcome =
  | { state: 'redirect'; url: string; sessionId: string }
  | { state: 'nothing-owed'; status: string }
  | { state: 'disabled' };

/**
 * Opens a hosted checkout session for what the loan still owes, as the server computes it, with
 * the loan and student as metadata and the idempotency key `loan-<id>-attempt-<n>`: a retried
 * request (the SDK's own retry, or two tabs asking at the same moment) gets the same session
 * back. A paid, waived or refunded loan gets no session. The service unreachable: 503, nothing kept.
 */
export async function startCheckout(
  db: Database,
  config: Config,
  loanId: number,
  urls: { success: string; cancel: string },
): Promise<CheckoutOutcome> {
  const client = paymentsClient(config);
  if (!client) return { state: 'disabled' };
  const fee = await feeRowOf(db, loanId);
  if (fee.owedCents <= 0) return { state: 'nothing-owed', status: fee.status };
  const [last] = await db
    .select({ attempt: max(feePaymentAttempts.attempt) })
    .from(feePaymentAttempts)
    .where(eq(feePaymentAttempts.loanId, loanId));
  const attempt = (last?.attempt ?? 0) + 1;
  const metadata = {
    loanId: String(loanId),
    studentId: String(fee.studentId),
    attempt: String(attempt),
  };
  let session: Stripe.Checkout.Session;
  try {
    session = await client.checkout.sessions.create(
      {
        mode: 'payment',
        line_items: [
          {
            quantity: 1,
            price_data: {
              currency: feeCurrency,
              unit_amount: fee.owedCents,
              product_data: {
                name: `Instrument usage fee${fee.schoolYear ? ` ${fee.schoolYear}` : ''}: ${fee.instrumentName} ${fee.assetTag}`,
              },
            },
          },
        ],
        client_reference_id: `loan-${loanId}`,
        metadata,
        payment_intent_data: { metadata },
        success_url: urls.success,
        cancel_url: urls.cancel,
      },
      { idempotencyKey: `loan-${loanId}-attempt-${attempt}` },
    );
  } catch (error) {
    if (isServiceDown(error)) throw paymentsUnavailable();
    throw error;
  }
  if (!session.url) throw paymentsUnavailable();
  await db
    .insert(feePaymentAttempts)
    .values({
      loanId,
      attempt,
      sessionId: session.id,
      amountCents: fee.owedCents,
      currency: feeCurrency,
    })
    .onConflictDoNothing();
  return { state: 'redirect', url: session.url, sessionId: session.id };
}

// ---------------------------------------------------------------------------------------------
// Webhooks.

/** Work to do with the service once the event's transaction has committed. */
type FollowUp =
  | { kind: 'expire'; loanId: number; sessionIds: string[]; paidBy: string }
  | {
      kind: 'refund-duplicate';
      loanId: number;
      attemptId: number;
      paymentIntent: string;
      amountCents: number;
      paidBy: string;
    };

/** What handling one event did (for the log and the answer). */
export interface WebhookOutcome {
  duplicate: boolean;
  outcome: string;
}

async function recordLedger(
  tx: Transaction,
  row: LoanRow,
  entry: {
    kind: 'payment' | 'manual-payment' | 'refund' | 'mismatch';
    amountCents: number;
    currency: string;
    reference: string | null;
    attemptId?: number | null;
    reason?: string | null;
    recordedBy?: number | null;
  },
): Promise<boolean> {
  const inserted = await tx
    .insert(feeLedger)
    .values({ loanId: row.loan.id, schoolId: row.loan.schoolId, ...entry })
    .onConflictDoNothing()
    .returning({ id: feeLedger.id, at: feeLedger.at });
  if (inserted.length === 0) return false;
  if (entry.kind === 'payment' || entry.kind === 'refund') {
    await queueFeeReceipt(tx, row, {
      kind: entry.kind,
      amountCents: entry.amountCents,
      reference: entry.reference,
      reason: entry.reason,
      at: inserted[0]!.at,
    });
  }
  return true;
}

async function completed(
  tx: Transaction,
  session: Stripe.Checkout.Session,
  followUps: FollowUp[],
): Promise<string> {
  const [attempt] = await tx
    .select()
    .from(feePaymentAttempts)
    .where(eq(feePaymentAttempts.sessionId, session.id));
  if (!attempt) return `unknown session ${session.id}`;
  // Two tabs' payments of one loan can complete at once; on a PostgreSQL server their events run
  // in parallel, so the loan's row is locked first and the second reads what the first wrote
  // (PostgreSQL manual, 13.3.2 "Row-Level Locks": SELECT … FOR UPDATE).
  await tx.select({ id: loans.id }).from(loans).where(eq(loans.id, attempt.loanId)).for('update');
  if (
    attempt.status === 'paid' ||
    attempt.status === 'mismatch' ||
    attempt.status.startsWith('duplicate')
  )
    return `session ${session.id} already settled`;
  const paymentIntent =
    typeof session.payment_intent === 'string'
      ? session.payment_intent
      : (session.payment_intent?.id ?? null);
  const received = session.amount_total ?? 0;
  const currency = (session.currency ?? '').toLowerCase();
  const row = await findLoanRow(tx, null, attempt.loanId);
  const settle = (status: (typeof attempt)['status'], note: string | null) =>
    tx
      .update(feePaymentAttempts)
      .set({
        status,
        note,
        paymentIntentId: paymentIntent,
        settledAt: new Date(),
        updatedAt: new Date(),
      })
      .where(eq(feePaymentAttempts.id, attempt.id));
  if (session.payment_status !== 'paid') {
    await settle('open', `completed without payment (${session.payment_status})`);
    return 'completed unpaid';
  }
  if (received !== attempt.amountCents || currency !== attempt.currency) {
    const note = `The service reports ${received} ${currency || '?'}; Tuttiboard asked for ${attempt.amountCents} ${attempt.currency}.`;
    await settle('mismatch', note);
    await recordLedger(tx, row, {
      kind: 'mismatch',
      amountCents: received,
      currency: currency || '?',
      reference: paymentIntent,
      attemptId: attempt.id,
      reason: note,
    });
    return 'mismatch';
  }
  const before = await feeRowOf(tx, attempt.loanId);
  const alreadySettled = before.owedCents <= 0;
  await recordLedger(tx, row, {
    kind: 'payment',
    amountCents: received,
    currency,
    reference: paymentIntent,
    attemptId: attempt.id,
    reason: alreadySettled ? `Duplicate: the fee was already ${before.status}` : null,
  });
  if (alreadySettled) {
    await settle(
      'duplicate-refunded',
      `A second payment while the fee was already ${before.status}: refunding it automatically.`,
    );
    followUps.push({
      kind: 'refund-duplicate',
      loanId: attempt.loanId,
      attemptId: attempt.id,
      paymentIntent: paymentIntent!,
      amountCents: received,
      paidBy: session.id,
    });
    return 'duplicate payment, refunding';
  }
  await settle('paid', null);
  const others = await tx
    .select({ sessionId: feePaymentAttempts.sessionId })
    .from(feePaymentAttempts)
    .where(
      and(
        eq(feePaymentAttempts.loanId, attempt.loanId),
        eq(feePaymentAttempts.status, 'open'),
        ne(feePaymentAttempts.id, attempt.id),
      ),
    );
  if (others.length) {
    await tx
      .update(feePaymentAttempts)
      .set({
        status: 'superseded',
        note: `Expired automatically: the fee was paid through ${session.id}.`,
        updatedAt: new Date(),
      })
      .where(
        and(
          eq(feePaymentAttempts.loanId, attempt.loanId),
          eq(feePaymentAttempts.status, 'open'),
          ne(feePaymentAttempts.id, attempt.id),
        ),
      );
    followUps.push({
      kind: 'expire',
      loanId: attempt.loanId,
      sessionIds: others.map((other) => other.sessionId),
      paidBy: session.id,
    });
  }
  return 'paid';
}

async function expired(tx: Transaction, session: Stripe.Checkout.Session): Promise<string> {
  const updated = await tx
    .update(feePaymentAttempts)
    .set({ status: 'expired', settledAt: new Date(), updatedAt: new Date() })
    .where(and(eq(feePaymentAttempts.sessionId, session.id), eq(feePaymentAttempts.status, 'open')))
    .returning({ id: feePaymentAttempts.id });
  return updated.length ? 'expired' : 'expiry noted (session not open here)';
}

async function refunded(tx: Transaction, charge: Stripe.Charge): Promise<string> {
  const paymentIntent =
    typeof charge.payment_intent === 'string'
      ? charge.payment_intent
      : (charge.payment_intent?.id ?? null);
  if (!paymentIntent) return 'refund without payment intent';
  const [attempt] = await tx
    .select()
    .from(feePaymentAttempts)
    .where(eq(feePaymentAttempts.paymentIntentId, paymentIntent));
  if (!attempt) return `refund of unknown payment ${paymentIntent}`;
  const row = await findLoanRow(tx, null, attempt.loanId);
  let recorded = 0;
  for (const refund of charge.refunds?.data ?? []) {
    const reason =
      refund.metadata?.['tuttiboardReason'] ??
      (refund.reason ? `Refunded at the service (${refund.reason})` : 'Refunded at the service');
    if (
      await recordLedger(tx, row, {
        kind: 'refund',
        amountCents: refund.amount,
        currency: refund.currency,
        reference: refund.id,
        attemptId: attempt.id,
        reason,
      })
    )
      recorded += 1;
  }
  return `${recorded} refund(s) recorded`;
}

/**
 * Handles one signed event from the service. The signature is checked by the SDK over the raw
 * body (a missing, wrong or stale one: 400, nothing written); each event id is recorded once, so
 * a replay or a duplicate delivery changes nothing.
 */
export async function handleWebhook(
  db: Database,
  config: Config,
  logger: Logger,
  rawBody: Buffer,
  signature: string | undefined,
): Promise<WebhookOutcome> {
  const client = paymentsClient(config);
  if (!client || !config.payments)
    throw new HttpError(404, 'not_found', 'Online payments are not configured.');
  let event: Stripe.Event;
  try {
    if (!signature) throw new Error('No signature header.');
    event = client.webhooks.constructEvent(rawBody, signature, config.payments.webhookSecret);
  } catch (error) {
    logger.warn(
      { reason: error instanceof Error ? error.message : String(error) },
      'Payments webhook refused: bad signature',
    );
    throw badRequest('The event signature could not be verified.');
  }
  const followUps: FollowUp[] = [];
  const result = await db.transaction(async (tx) => {
    const fresh = await tx
      .insert(paymentEvents)
      .values({ eventId: event.id, type: event.type })
      .onConflictDoNothing()
      .returning({ id: paymentEvents.eventId });
    if (fresh.length === 0) return { duplicate: true, outcome: 'already handled' };
    let outcome = 'ignored';
    if (event.type === 'checkout.session.completed')
      outcome = await completed(tx, event.data.object, followUps);
    else if (event.type === 'checkout.session.expired')
      outcome = await expired(tx, event.data.object);
    else if (event.type === 'charge.refunded') outcome = await refunded(tx, event.data.object);
    await tx.update(paymentEvents).set({ outcome }).where(eq(paymentEvents.eventId, event.id));
    return { duplicate: false, outcome };
  });
  logger.info({ event: event.id, type: event.type, ...result }, 'Payments webhook');
  for (const followUp of followUps) await followUpWith(db, client, logger, followUp);
  return result;
}

async function followUpWith(
  db: Database,
  client: Stripe,
  logger: Logger,
  followUp: FollowUp,
): Promise<void> {
  if (followUp.kind === 'expire') {
    for (const sessionId of followUp.sessionIds) {
      try {
        await client.checkout.sessions.expire(sessionId);
      } catch (error) {
        // Already paid or expired at the service: its own event will tell us which.
        logger.warn(
          { sessionId, error: error instanceof Error ? error.message : String(error) },
          'Could not expire a superseded checkout session',
        );
      }
    }
    return;
  }
  const reason = `Duplicate payment refunded automatically: the fee was already paid (${followUp.paidBy}).`;
  try {
    const refund = await client.refunds.create(
      {
        payment_intent: followUp.paymentIntent,
        amount: followUp.amountCents,
        reason: 'duplicate',
        metadata: { loanId: String(followUp.loanId), tuttiboardReason: reason },
      },
      { idempotencyKey: `loan-${followUp.loanId}-duplicate-${followUp.attemptId}` },
    );
    await db.transaction(async (tx) => {
      const row = await findLoanRow(tx, null, followUp.loanId);
      await recordLedger(tx, row, {
        kind: 'refund',
        amountCents: refund.amount,
        currency: refund.currency,
        reference: refund.id,
        attemptId: followUp.attemptId,
        reason,
      });
    });
  } catch (error) {
    logger.error(
      { loanId: followUp.loanId, error: error instanceof Error ? error.message : String(error) },
      'Could not refund a duplicate payment',
    );
    await db
      .update(feePaymentAttempts)
      .set({
        status: 'duplicate-refund-failed',
        note: 'A second payment could not be refunded automatically: refund it from the Fees screen.',
        updatedAt: new Date(),
      })
      .where(eq(feePaymentAttempts.id, followUp.attemptId));
  }
}

// ---------------------------------------------------------------------------------------------
// The business office: refunds, payments by hand, reconciliation.

/**
 * Refunds (part of) a loan's fee through the service, from its online payments, newest first.
 * The refund is recorded at once and again (a no-op) when its `charge.refunded` event arrives.
 */
export async function refundFee(
  db: Database,
  config: Config,
  actor: Actor,
  loanId: number,
  input: RefundInput,
) {
  const client = paymentsClient(config);
  const fee = await feeRowOf(db, loanId, actor);
  const refundable = fee.paidCents + fee.mismatchCents - fee.refundedCents;
  if (refundable <= 0)
    throw stateConflict('Nothing has been paid on this loan, so there is nothing to refund.');
  const amount = input.amountCents ?? refundable;
  if (amount > refundable)
    throw badRequest(`At most $${(refundable / 100).toFixed(2)} can be refunded.`, [
      { field: 'amountCents', message: 'More than was paid.' },
    ]);
  const attempts = await db
    .select()
    .from(feePaymentAttempts)
    .where(
      and(
        eq(feePaymentAttempts.loanId, loanId),
        sql`${feePaymentAttempts.paymentIntentId} is not null`,
      ),
    )
    .orderBy(sql`${feePaymentAttempts.attempt} desc`);
  const ledger = await db.select().from(feeLedger).where(eq(feeLedger.loanId, loanId));
  let remaining = amount;
  const done: { id: string; amount: number }[] = [];
  if (attempts.length && !client) throw paymentsUnavailable();
  for (const attempt of attempts) {
    if (remaining <= 0) break;
    const inCents = ledger
      .filter(
        (entry) =>
          entry.attemptId === attempt.id &&
          entry.kind !== 'refund' &&
          entry.kind !== 'manual-payment',
      )
      .reduce((sum, entry) => sum + entry.amountCents, 0);
    const outCents = ledger
      .filter((entry) => entry.attemptId === attempt.id && entry.kind === 'refund')
      .reduce((sum, entry) => sum + entry.amountCents, 0);
    const part = Math.min(remaining, inCents - outCents);
    if (part <= 0) continue;
    try {
      const refund = await client!.refunds.create(
        {
          payment_intent: attempt.paymentIntentId!,
          amount: part,
          reason: 'requested_by_customer',
          metadata: { loanId: String(loanId), tuttiboardReason: input.reason },
        },
        { idempotencyKey: `loan-${loanId}-refund-${attempt.id}-${outCents}-${part}` },
      );
      done.push({ id: refund.id, amount: refund.amount });
      await db.transaction(async (tx) => {
        const row = await findLoanRow(tx, null, loanId);
        await recordLedger(tx, row, {
          kind: 'refund',
          amountCents: refund.amount,
          currency: refund.currency,
          reference: refund.id,
          attemptId: attempt.id,
          reason: input.reason,
          recordedBy: actor.userId,
        });
        await recordAudit(tx, actor, {
          action: 'refund',
          entity: 'loan-fee',
          entityId: loanId,
          after: { refund: refund.id, amountCents: refund.amount, reason: input.reason },
        });
      });
      remaining -= refund.amount;
    } catch (error) {
      if (isServiceDown(error)) throw paymentsUnavailable();
      throw error;
    }
  }
  if (remaining > 0) {
    // Money taken by hand goes back by hand: the ledger records it with the reason.
    await db.transaction(async (tx) => {
      const row = await findLoanRow(tx, null, loanId);
      await recordLedger(tx, row, {
        kind: 'refund',
        amountCents: remaining,
        currency: feeCurrency,
        reference: null,
        reason: `${input.reason} (paid back by hand)`,
        recordedBy: actor.userId,
      });
      await recordAudit(tx, actor, {
        action: 'refund',
        entity: 'loan-fee',
        entityId: loanId,
        after: { byHand: remaining, reason: input.reason },
      });
    });
  }
  return feeRowOf(db, loanId, actor);
}

/** Records a payment taken by hand (cash, cheque), as fees were before online payment. */
export async function recordManualPayment(
  db: Database,
  actor: Actor,
  loanId: number,
  input: { amountCents: number; note: string },
) {
  const fee = await feeRowOf(db, loanId, actor);
  if (fee.status === 'waived')
    throw stateConflict('This loan’s fee is waived; there is nothing to pay.');
  await db.transaction(async (tx) => {
    const row = await findLoanRow(tx, null, loanId);
    await recordLedger(tx, row, {
      kind: 'manual-payment',
      amountCents: input.amountCents,
      currency: feeCurrency,
      reference: null,
      reason: input.note,
      recordedBy: actor.userId,
    });
    await recordAudit(tx, actor, {
      action: 'payment',
      entity: 'loan-fee',
      entityId: loanId,
      after: input,
    });
  });
  return feeRowOf(db, loanId, actor);
}

/**
 * The service's checkout sessions and refunds set against our ledger: every completed session
 * should be one ledger payment (or mismatch) of the same amount, every refund one ledger refund.
 */
export async function reconcile(db: Database, config: Config): Promise<Reconciliation> {
  const client = paymentsClient(config);
  if (!client) return { rows: [], mismatches: 0 };
  let sessions: Stripe.Checkout.Session[];
  let refunds: Stripe.Refund[];
  try {
    sessions = await client.checkout.sessions
      .list({ limit: 100 })
      .autoPagingToArray({ limit: 10_000 });
    refunds = await client.refunds.list({ limit: 100 }).autoPagingToArray({ limit: 10_000 });
  } catch (error) {
    if (isServiceDown(error)) throw paymentsUnavailable();
    throw error;
  }
  const attempts = await db.select().from(feePaymentAttempts);
  const ledger = await db.select().from(feeLedger);
  const rows: Reconciliation['rows'] = [];
  for (const session of sessions.filter((each) => each.payment_status === 'paid')) {
    const paymentIntent =
      typeof session.payment_intent === 'string'
        ? session.payment_intent
        : (session.payment_intent?.id ?? null);
    const attempt = attempts.find((each) => each.sessionId === session.id);
    const paidHere = ledger
      .filter((entry) => entry.reference === paymentIntent && entry.kind === 'payment')
      .reduce((sum, entry) => sum + entry.amountCents, 0);
    const mismatchHere = ledger
      .filter((entry) => entry.reference === paymentIntent && entry.kind === 'mismatch')
      .reduce((sum, entry) => sum + entry.amountCents, 0);
    const serviceRefunds = refunds.filter((refund) => refund.payment_intent === paymentIntent);
    const serviceRefunded = serviceRefunds.reduce((sum, refund) => sum + refund.amount, 0);
    const ledgerRefunded = ledger
      .filter(
        (entry) =>
          entry.kind === 'refund' && serviceRefunds.some((refund) => refund.id === entry.reference),
      )
      .reduce((sum, entry) => sum + entry.amountCents, 0);
    let problem: string | null = null;
    if (!attempt) problem = 'A payment at the service that Tuttiboard did not ask for.';
    else if (mismatchHere > 0)
      problem = 'The amount or currency paid differs from the fee asked for.';
    else if (paidHere !== (session.amount_total ?? 0))
      problem =
        paidHere === 0
          ? 'Paid at the service, not in the ledger (event not received yet?).'
          : 'The ledger’s amount differs from the service’s.';
    else if (ledgerRefunded !== serviceRefunded)
      problem = 'Refunds at the service differ from the ledger’s.';
    rows.push({
      sessionId: session.id,
      paymentIntent,
      loanId: attempt?.loanId ?? (Number(session.metadata?.['loanId']) || null),
      serviceAmountCents: session.amount_total ?? 0,
      serviceRefundedCents: serviceRefunded,
      ledgerPaidCents: paidHere + mismatchHere,
      ledgerRefundedCents: ledgerRefunded,
      currency: session.currency ?? '',
      ok: problem === null,
      problem,
    });
  }
  const servicePayments = new Set(rows.map((row) => row.paymentIntent));
  for (const entry of ledger.filter(
    (each) => each.kind === 'payment' && each.reference && !servicePayments.has(each.reference),
  )) {
    rows.push({
      sessionId: attempts.find((attempt) => attempt.id === entry.attemptId)?.sessionId ?? null,
      paymentIntent: entry.reference,
      loanId: entry.loanId,
      serviceAmountCents: 0,
      serviceRefundedCents: 0,
      ledgerPaidCents: entry.amountCents,
      ledgerRefundedCents: 0,
      currency: entry.currency,
      ok: false,
      problem: 'In the ledger, but the service has no such payment.',
    });
  }
  return { rows, mismatches: rows.filter((row) => !row.ok).length };
}
