import { createHmac, timingSafeEqual } from 'node:crypto';
import type Stripe from 'stripe';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { feeLedger, feePaymentAttempts } from '../db/schema/index';
import type { Reconciliation } from '@shared/api/fee';
import { sessionSecret } from '../core/settings';
import { recordAudit } from '../core/audit';
import type { Actor } from '../core/policy';
import { stateConflict } from '../instruments/instruments-service';
import { findLoanRow } from '../loans/loans-queries';
import { feeRowOf } from './fees-queries';
import { isServiceDown, paymentsClient, paymentsUnavailable } from './payments-client';
import { feeCurrency, paymentIntentOf, recordLedger } from './payments-ledger';

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
// The business office: payments by hand, reconciliation (refunds: payments-refunds.ts).

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
    const paymentIntent = paymentIntentOf(session.payment_intent);
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
