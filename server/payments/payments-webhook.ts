import { and, eq, ne } from 'drizzle-orm';
import type Stripe from 'stripe';
import type { Config } from '../config';
import type { Database, Transaction } from '../db/client';
import { feePaymentAttempts, loans, paymentEvents } from '../db/schema/index';
import { badRequest, HttpError } from '../core/errors';
import type { Logger } from '../logger';
import { findLoanRow } from '../loans/loans-queries';
import { feeRowOf } from './fees-queries';
import { paymentsClient } from './payments-client';
import { paymentIntentOf, recordLedger, recordRefund } from './payments-ledger';

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

type Attempt = typeof feePaymentAttempts.$inferSelect;

/** Settles an attempt: its status, a note, the payment intent that paid it. */
function settleAttempt(tx: Transaction, attempt: Attempt, paymentIntent: string | null) {
  return (status: Attempt['status'], note: string | null) =>
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
}

/**
 * The loan's other open attempts once one has paid: marked superseded here, and expired at the
 * service after the commit.
 */
async function supersedeOtherAttempts(
  tx: Transaction,
  attempt: Attempt,
  paidBy: string,
  followUps: FollowUp[],
): Promise<void> {
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
        note: `Expired automatically: the fee was paid through ${paidBy}.`,
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
      paidBy,
    });
  }
}

/** The session's attempt with its loan's row locked, unless it is unknown or settled already. */
async function attemptToSettle(
  tx: Transaction,
  session: Stripe.Checkout.Session,
): Promise<Attempt | string> {
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
  return attempt;
}

/**
 * A completed session: recorded as paid, as a mismatch (amount or currency not what was asked),
 * or as a second payment of a settled fee, refunded after the commit.
 */
async function completed(
  tx: Transaction,
  session: Stripe.Checkout.Session,
  followUps: FollowUp[],
): Promise<string> {
  const attempt = await attemptToSettle(tx, session);
  if (typeof attempt === 'string') return attempt;
  const paymentIntent = paymentIntentOf(session.payment_intent);
  const received = session.amount_total ?? 0;
  const currency = (session.currency ?? '').toLowerCase();
  const row = await findLoanRow(tx, null, attempt.loanId);
  const settle = settleAttempt(tx, attempt, paymentIntent);
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
  await supersedeOtherAttempts(tx, attempt, session.id, followUps);
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
  const paymentIntent = paymentIntentOf(charge.payment_intent);
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
    if (await recordRefund(tx, row, refund, attempt.id, reason)) recorded += 1;
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
