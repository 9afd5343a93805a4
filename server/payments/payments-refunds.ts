import { and, eq, sql } from 'drizzle-orm';
import type Stripe from 'stripe';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { feeLedger, feePaymentAttempts } from '../db/schema/index';
import type { RefundInput } from '@shared/api/fee';
import { recordAudit } from '../core/audit';
import { badRequest } from '../core/errors';
import type { Actor } from '../core/policy';
import { stateConflict } from '../instruments/instruments-service';
import { findLoanRow } from '../loans/loans-queries';
import { feeRowOf } from './fees-queries';
import { isServiceDown, paymentsClient, paymentsUnavailable } from './payments-client';
import { feeCurrency, recordLedger, recordRefund } from './payments-ledger';

type Attempt = typeof feePaymentAttempts.$inferSelect;
type LedgerEntry = typeof feeLedger.$inferSelect;

/** What the refund asks for, at most what was paid and not refunded; all of it by default. */
function refundAmount(fee: Awaited<ReturnType<typeof feeRowOf>>, input: RefundInput): number {
  const refundable = fee.paidCents + fee.mismatchCents - fee.refundedCents;
  if (refundable <= 0)
    throw stateConflict('Nothing has been paid on this loan, so there is nothing to refund.');
  const amount = input.amountCents ?? refundable;
  if (amount > refundable)
    throw badRequest(`At most $${(refundable / 100).toFixed(2)} can be refunded.`, [
      { field: 'amountCents', message: 'More than was paid.' },
    ]);
  return amount;
}

/** What an online payment took in, and what has gone back from it, by the ledger. */
function attemptBalance(ledger: LedgerEntry[], attempt: Attempt) {
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
  return { inCents, outCents };
}

/** Refunds part of one online payment through the service and records it with history. */
async function refundAttempt(
  db: Database,
  client: Stripe,
  actor: Actor,
  loanId: number,
  input: RefundInput,
  attempt: Attempt,
  part: { amount: number; outCents: number },
): Promise<Stripe.Refund> {
  try {
    const refund = await client.refunds.create(
      {
        payment_intent: attempt.paymentIntentId!,
        amount: part.amount,
        reason: 'requested_by_customer',
        metadata: { loanId: String(loanId), tuttiboardReason: input.reason },
      },
      { idempotencyKey: `loan-${loanId}-refund-${attempt.id}-${part.outCents}-${part.amount}` },
    );
    await db.transaction(async (tx) => {
      const row = await findLoanRow(tx, null, loanId);
      await recordRefund(tx, row, refund, attempt.id, input.reason, actor.userId);
      await recordAudit(tx, actor, {
        action: 'refund',
        entity: 'loan-fee',
        entityId: loanId,
        after: { refund: refund.id, amountCents: refund.amount, reason: input.reason },
      });
    });
    return refund;
  } catch (error) {
    if (isServiceDown(error)) throw paymentsUnavailable();
    throw error;
  }
}

/**
 * Refunds up to `amount` through the service from the loan's online payments, newest first;
 * answers what is left to pay back.
 */
async function refundOnline(
  db: Database,
  config: Config,
  actor: Actor,
  loanId: number,
  input: RefundInput,
  amount: number,
): Promise<number> {
  const client = paymentsClient(config);
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
  if (attempts.length && !client) throw paymentsUnavailable();
  for (const attempt of attempts) {
    if (remaining <= 0) break;
    const { inCents, outCents } = attemptBalance(ledger, attempt);
    const part = Math.min(remaining, inCents - outCents);
    if (part <= 0) continue;
    const refund = await refundAttempt(db, client!, actor, loanId, input, attempt, {
      amount: part,
      outCents,
    });
    remaining -= refund.amount;
  }
  return remaining;
}

/** Records money paid back by hand, with the reason. */
async function recordRefundByHand(
  db: Database,
  actor: Actor,
  loanId: number,
  input: RefundInput,
  amountCents: number,
): Promise<void> {
  await db.transaction(async (tx) => {
    const row = await findLoanRow(tx, null, loanId);
    await recordLedger(tx, row, {
      kind: 'refund',
      amountCents,
      currency: feeCurrency,
      reference: null,
      reason: `${input.reason} (paid back by hand)`,
      recordedBy: actor.userId,
    });
    await recordAudit(tx, actor, {
      action: 'refund',
      entity: 'loan-fee',
      entityId: loanId,
      after: { byHand: amountCents, reason: input.reason },
    });
  });
}

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
  const fee = await feeRowOf(db, loanId, actor);
  const amount = refundAmount(fee, input);
  const remaining = await refundOnline(db, config, actor, loanId, input, amount);
  // Money taken by hand goes back by hand: the ledger records it with the reason.
  if (remaining > 0) await recordRefundByHand(db, actor, loanId, input, remaining);
  return feeRowOf(db, loanId, actor);
}
